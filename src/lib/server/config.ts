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
  smtp: { host: string; port: number; from: string };
  publicUrl: string;
  /** Every date and time a page or the tablet shows is in this zone and locale. */
  clinic: Clinic;
}

let cached: ServerConfig | null = null;

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
  const port = process.env.PORT ?? '4321';
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
    smtp: {
      host: process.env.SMTP_HOST ?? '127.0.0.1',
      port: Number(process.env.SMTP_PORT ?? 1025),
      from: process.env.MAIL_FROM ?? 'Coneline <coneline@localhost>',
    },
    publicUrl: process.env.PUBLIC_URL ?? `http://localhost:${port}`,
    clinic: clinicFromEnv(),
  };
  return cached;
}
