/**
 * What a real install must have before `npm run serve` starts it, as one list of
 * requirements per feature. `preflight` is pure: it reads the environment and the facts
 * serve learned from the database, and returns every problem in plain words, all at once.
 */
import { isIP, isIPv4 } from 'node:net';

export type Env = Readonly<Record<string, string | undefined>>;
/** Features that need settings of their own; each is listed in BUILT_FEATURES once it exists. */
export type Feature = 'mail' | 'storage';

/** What serve learned about the installation before starting. */
export interface InstallFacts {
  /** Active accounts of the invented demo clinic. */
  activeDemoAccounts: number;
  /** The features this version has (default BUILT_FEATURES); tests pass others. */
  features?: readonly Feature[];
}

/**
 * Review notices send mail (docs/review.md); when radiographs are stored, add 'storage'.
 */
export const BUILT_FEATURES: readonly Feature[] = ['mail'];

interface Requirement {
  /** `core` applies to every real install; a feature's only while that feature is built. */
  feature: 'core' | Feature;
  /** A plain-worded problem, or null when this requirement is met. */
  check(env: Env, facts: InstallFacts): string | null;
}

const set = (env: Env, name: string) => (env[name] ?? '').trim() !== '';

/** The listening address reaches no other machine. */
export function isLoopback(host: string): boolean {
  const h = host
    .trim()
    .toLowerCase()
    .replace(/^\[(.*)\]$/, '$1');
  if (h === 'localhost' || h === '::1') return true;
  const v4 = h.startsWith('::ffff:') ? h.slice(7) : h;
  return isIPv4(v4) && v4.startsWith('127.');
}

/** Every variable in `names` must be set for `what` to work. */
function needs(feature: Feature, what: string, names: string[]): Requirement {
  return {
    feature,
    check: (env) => {
      const missing = names.filter((n) => !set(env, n));
      return missing.length === 0 ? null : `To ${what}, Coneline needs ${missing.join(', ')} (not set).`;
    },
  };
}

export const REQUIREMENTS: readonly Requirement[] = [
  {
    feature: 'core',
    check: (_env, facts) =>
      facts.activeDemoAccounts === 0
        ? null
        : `The invented demo clinic is still in the database (${facts.activeDemoAccounts} active demo account${facts.activeDemoAccounts === 1 ? '' : 's'}, whose password is published). Remove it with: npm run demo:remove`,
  },
  {
    feature: 'core',
    check: (env) => {
      const secret = env.AUTH_SECRET ?? '';
      if (secret === '') {
        return 'AUTH_SECRET is not set. A real install keeps its own secret of at least 32 characters in its environment, not the file the demo generates; make one with: openssl rand -hex 32';
      }
      return secret.length < 32
        ? `AUTH_SECRET is ${secret.length} characters; it must be at least 32 (make one with: openssl rand -hex 32).`
        : null;
    },
  },
  {
    feature: 'core',
    check: (env) => {
      const host = env.HOST ?? '127.0.0.1';
      if (set(env, 'PUBLIC_HOST') || isLoopback(host)) return null;
      return `PUBLIC_HOST is not set, but HOST=${host || '(empty: every address)'} lets other machines in. Set PUBLIC_HOST to the name people open Coneline by (for example coneline.school.example): the origin check refuses sign-in forms from any other name.`;
    },
  },
  {
    feature: 'core',
    check: (env) => {
      const name = (env.PUBLIC_HOST ?? '').trim();
      if (name === '' || isIP(name) || /^[a-z0-9.-]+$/i.test(name)) return null;
      return `PUBLIC_HOST must be a host name only, like coneline.school.example: no https://, port or path (it is "${name}").`;
    },
  },
  {
    feature: 'core',
    check: (env) =>
      set(env, 'SERVER_CERT_PATH') === set(env, 'SERVER_KEY_PATH')
        ? null
        : 'SERVER_CERT_PATH and SERVER_KEY_PATH go together: with only one of them set, Coneline would serve plain HTTP.',
  },
  {
    feature: 'core',
    check: (env) =>
      env.HTTPS !== '1'
        ? null
        : "HTTPS=1 makes a self-signed certificate for a demo (npm start). A real install serves HTTPS behind the school's TLS proxy (TRUST_PROXY=1), or with SERVER_CERT_PATH and SERVER_KEY_PATH.",
  },
  // Links in invitations and password resets must point at the site itself: PUBLIC_URL.
  needs('mail', 'send e-mail (invitations, password resets, review notices)', ['SMTP_HOST', 'MAIL_FROM', 'PUBLIC_URL']),
  needs('storage', 'store radiographs', ['S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY']),
];

/** Every problem that keeps this installation from starting for real use; empty when none. */
export function preflight(env: Env, facts: InstallFacts): string[] {
  const features = facts.features ?? BUILT_FEATURES;
  return REQUIREMENTS.filter((r) => r.feature === 'core' || features.includes(r.feature))
    .map((r) => r.check(env, facts))
    .filter((p): p is string => p !== null);
}
