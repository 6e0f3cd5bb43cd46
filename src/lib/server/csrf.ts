/** Fetches an Auth.js CSRF token for a server-rendered form, forwarding its cookie. */
import { Auth } from '@auth/core';
import type { AstroGlobal } from 'astro';
import authConfig from '../../../auth.config';

export async function csrfToken(Astro: AstroGlobal): Promise<string> {
  const url = new URL('/api/auth/csrf', Astro.url);
  const res = await Auth(new Request(url, { headers: Astro.request.headers }), authConfig);
  for (const cookie of res.headers.getSetCookie()) Astro.response.headers.append('Set-Cookie', cookie);
  const body = (await res.json()) as { csrfToken?: string };
  return body.csrfToken ?? '';
}
