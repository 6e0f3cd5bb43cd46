/**
 * The one typed place the server reads its environment from. Every value has a default
 * that makes `npm start` work on a fresh machine with no variables set.
 */
import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { clinicProblem, DEFAULT_CLINIC, type Clinic } from '../present/format';
import { dataPaths, secureDataDir, securePrivateFile } from './files';

export interface ServerConfig {
  dbFile: string;
  dataDir: string;
  authSecret: string;
  s3: { endpoint: string | undefined; bucket: string; region: string; accessKeyId: string; secretAccessKey: string };
  smtp: SmtpConfig;
  mail: MailTiming;
  publicUrl: string;
  /** Every date and time a page or the tablet shows is in this zone and locale. */
  clinic: Clinic;
}

/** The SMTP server e-mail goes through; the defaults reach the stand-in `npm start` runs. */
export interface SmtpConfig {
  host: string;
  port: number;
  /** TLS from the first byte (port 465); otherwise STARTTLS when the server offers it. */
  secure: boolean;
  user: string | undefined;
  pass: string | undefined;
  from: string;
}

/** How often the outbox is looked at, and the first wait before sending a failed e-mail again. */
export interface MailTiming {
  pollMs: number;
  retryMs: number;
}

let cached: ServerConfig | null = null;

const positive = (raw: string | undefined, fallback: number, name: string): number => {
  if (raw === undefined || raw.trim() === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n <= 0) throw new Error(`${name} must be a positive whole number (it is "${raw}")`);
  return n;
};

/** PUBLIC_URL (the address links in e-mail lead to), without a trailing slash; default the local server. */
export function publicUrlFromEnv(env: NodeJS.ProcessEnv = process.env): string {
  return (env.PUBLIC_URL?.trim() || `http://localhost:${env.PORT ?? '4321'}`).replace(/\/+$/, '');
}

/** SMTP_HOST, SMTP_PORT, SMTP_SECURE (1/true), SMTP_USER, SMTP_PASS, MAIL_FROM. */
export function smtpFromEnv(env: NodeJS.ProcessEnv = process.env): SmtpConfig {
  const secure = /^(1|true|yes)$/i.test(env.SMTP_SECURE?.trim() ?? '');
  return {
    host: env.SMTP_HOST?.trim() || '127.0.0.1',
    port: positive(env.SMTP_PORT, secure ? 465 : 1025, 'SMTP_PORT'),
    secure,
    user: env.SMTP_USER?.trim() || undefined,
    pass: env.SMTP_PASS || undefined,
    from: env.MAIL_FROM?.trim() || 'Coneline <coneline@localhost>',
  };
}

/** Reads AUTH_SECRET, or keeps a generated one in the data folder so sessions survive restarts. */
function authSecret(dataDir: string): string {
  const fromEnv = process.env.AUTH_SECRET;
  // A short secret is refused, never quietly replaced: the operator meant to set one.
  if (fromEnv !== undefined && fromEnv.length < 32) throw new Error('AUTH_SECRET must be at least 32 characters');
  if (fromEnv) return fromEnv;
  const file = resolve(dataDir, 'auth-secret');
  secureDataDir(dataDir);
  if (existsSync(file)) {
    securePrivateFile(file); // one left readable by a hand edit or a copy: anyone who reads it can sign sessions
    return readFileSync(file, 'utf8').trim();
  }
  const secret = randomBytes(32).toString('hex');
  writeFileSync(file, secret + '\n', { mode: 0o600 });
  return secret;
}

/**
 * CLINIC_TIME_ZONE (IANA, default Europe/London) and CLINIC_LOCALE (BCP 47, default en-GB).
 * A value Intl does not know is refused at start, never quietly replaced by the default.
 */
export function clinicFromEnv(env: NodeJS.ProcessEnv = process.env): Clinic {
  const clinic = {
    timeZone: env.CLINIC_TIME_ZONE?.trim() || DEFAULT_CLINIC.timeZone,
    locale: env.CLINIC_LOCALE?.trim() || DEFAULT_CLINIC.locale,
  };
  const problem = clinicProblem(clinic);
  if (problem) throw new Error(`CLINIC_TIME_ZONE / CLINIC_LOCALE: ${problem}`);
  return clinic;
}

export function config(): ServerConfig {
  if (cached) return cached;
  const { dbFile, dataDir } = dataPaths();
  cached = {
    dbFile,
    dataDir,
    authSecret: authSecret(dataDir),
    s3: {
      endpoint: process.env.S3_ENDPOINT,
      bucket: process.env.S3_BUCKET ?? 'coneline-radiographs',
      region: process.env.S3_REGION ?? 'us-east-1',
      accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER',
      secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER',
    },
    smtp: smtpFromEnv(),
    // MAIL_POLL_MS and MAIL_RETRY_MS are for tests and demos; the defaults suit a clinic.
    mail: {
      pollMs: positive(process.env.MAIL_POLL_MS, 15_000, 'MAIL_POLL_MS'),
      retryMs: positive(process.env.MAIL_RETRY_MS, 30_000, 'MAIL_RETRY_MS'),
    },
    publicUrl: publicUrlFromEnv(),
    clinic: clinicFromEnv(),
  };
  return cached;
}
