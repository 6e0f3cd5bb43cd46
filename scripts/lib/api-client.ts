/** An API client signed in through the real Auth.js credentials flow. */

export interface ApiClient {
  baseUrl: string;
  cookie: string;
  fetch(path: string, init?: RequestInit): Promise<Response>;
  /** POSTs JSON with this site's Origin, as the tablet does. */
  post(path: string, body: unknown, init?: RequestInit): Promise<Response>;
}

function cookiesFrom(res: Response, jar: Map<string, string>): void {
  for (const c of res.headers.getSetCookie()) {
    const [pair] = c.split(';');
    const eq = pair!.indexOf('=');
    const name = pair!.slice(0, eq);
    const value = pair!.slice(eq + 1);
    if (value === '' || /Max-Age=0/i.test(c)) jar.delete(name);
    else jar.set(name, value);
  }
}

const header = (jar: Map<string, string>) => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');

/** Signs in; resolves to a client, or rejects with the page the server sent back. */
export async function apiSignIn(baseUrl: string, email: string, password: string): Promise<ApiClient> {
  const jar = new Map<string, string>();
  const csrfRes = await fetch(`${baseUrl}/api/auth/csrf`);
  cookiesFrom(csrfRes, jar);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${baseUrl}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Origin: baseUrl, Cookie: header(jar) },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: '/' }),
  });
  cookiesFrom(res, jar);
  if (![...jar.keys()].some((k) => k.endsWith('authjs.session-token'))) {
    throw new Error(`sign-in failed for ${email}: ${res.status} ${res.headers.get('location') ?? ''}`);
  }
  return client(baseUrl, jar);
}

export function anonymous(baseUrl: string): ApiClient {
  return client(baseUrl, new Map());
}

function client(baseUrl: string, jar: Map<string, string>): ApiClient {
  const api: ApiClient = {
    baseUrl,
    get cookie() {
      return header(jar);
    },
    async fetch(path, init = {}) {
      const headers = new Headers(init.headers);
      if (jar.size > 0 && !headers.has('Cookie')) headers.set('Cookie', header(jar));
      const res = await fetch(baseUrl + path, { redirect: 'manual', ...init, headers });
      cookiesFrom(res, jar);
      return res;
    },
    post(path, body, init = {}) {
      const headers = new Headers(init.headers);
      if (!headers.has('Content-Type')) headers.set('Content-Type', 'application/json');
      if (!headers.has('Origin')) headers.set('Origin', baseUrl);
      return api.fetch(path, {
        method: 'POST',
        ...init,
        headers,
        body: typeof body === 'string' ? body : JSON.stringify(body),
      });
    },
  };
  return api;
}

export const DEMO = {
  password: 'coneline-demo-2026',
  mira: 'mira.okafor@larkfield.example',
  tomas: 'tomas.lindqvist@larkfield.example',
  priya: 'priya.raman@larkfield.example',
  helen: 'helen.vasquez@larkfield.example',
  samuel: 'samuel.osei@larkfield.example',
  ingrid: 'ingrid.holm@larkfield.example',
} as const;
