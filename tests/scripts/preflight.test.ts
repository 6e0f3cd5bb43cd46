import { describe, expect, it } from 'vitest';
import { BUILT_FEATURES, isLoopback, preflight, type Env, type InstallFacts } from '../../scripts/lib/preflight';

const SECRET = 'x'.repeat(32);
// The core requirements alone; the features' own are tested below.
const REAL: InstallFacts = { activeDemoAccounts: 0, features: [] };

describe('preflight', () => {
  it.each<[string, Env, InstallFacts, RegExp[]]>([
    ['a real install on this machine only', { AUTH_SECRET: SECRET }, REAL, []],
    [
      'behind a proxy, listening everywhere, with its public name',
      { AUTH_SECRET: SECRET, HOST: '0.0.0.0', PUBLIC_HOST: 'coneline.school.example', TRUST_PROXY: '1' },
      REAL,
      [],
    ],
    [
      'an active demo account',
      { AUTH_SECRET: SECRET },
      { activeDemoAccounts: 6, features: [] },
      [/6 active demo accounts.*npm run demo:remove/],
    ],
    ['no AUTH_SECRET', {}, REAL, [/AUTH_SECRET is not set.*openssl rand -hex 32/]],
    ['an empty AUTH_SECRET', { AUTH_SECRET: '' }, REAL, [/AUTH_SECRET is not set/]],
    [
      'an AUTH_SECRET under 32 characters',
      { AUTH_SECRET: 'x'.repeat(31) },
      REAL,
      [/AUTH_SECRET is 31 characters; it must be at least 32/],
    ],
    [
      'every address without PUBLIC_HOST',
      { AUTH_SECRET: SECRET, HOST: '0.0.0.0' },
      REAL,
      [/PUBLIC_HOST is not set, but HOST=0.0.0.0/],
    ],
    [
      'an empty HOST (every address) without PUBLIC_HOST',
      { AUTH_SECRET: SECRET, HOST: '' },
      REAL,
      [/PUBLIC_HOST is not set, but HOST=\(empty/],
    ],
    [
      'a LAN address without PUBLIC_HOST',
      { AUTH_SECRET: SECRET, HOST: '192.168.1.20' },
      REAL,
      [/PUBLIC_HOST is not set/],
    ],
    [
      'PUBLIC_HOST written as a URL',
      { AUTH_SECRET: SECRET, PUBLIC_HOST: 'https://coneline.school.example/' },
      REAL,
      [/PUBLIC_HOST must be a host name only/],
    ],
    [
      'a certificate without its key',
      { AUTH_SECRET: SECRET, SERVER_CERT_PATH: '/etc/coneline/cert.pem' },
      REAL,
      [/SERVER_CERT_PATH and SERVER_KEY_PATH go together/],
    ],
    [
      "the demo's self-signed HTTPS",
      { AUTH_SECRET: SECRET, HTTPS: '1' },
      REAL,
      [/HTTPS=1 makes a self-signed certificate/],
    ],
    [
      'everything wrong at once, each named',
      { HOST: '::' },
      { activeDemoAccounts: 1, features: [] },
      [/1 active demo account,/, /AUTH_SECRET is not set/, /PUBLIC_HOST is not set, but HOST=::/],
    ],
  ])('%s', (_name, env, facts, expected) => {
    const problems = preflight(env, facts);
    expect(problems).toHaveLength(expected.length);
    expected.forEach((pattern, i) => expect(problems[i]).toMatch(pattern));
  });

  it('asks for the mail settings now that review notices send e-mail, and nothing of storage yet', () => {
    expect(BUILT_FEATURES).toEqual(['mail']);
    expect(preflight({ AUTH_SECRET: SECRET }, { activeDemoAccounts: 0 })).toEqual([
      'To send e-mail (invitations, password resets, review notices), Coneline needs SMTP_HOST, MAIL_FROM, PUBLIC_URL (not set).',
    ]);
    expect(preflight({ AUTH_SECRET: SECRET }, REAL)).toEqual([]);
  });

  it.each<[string, InstallFacts['features'], Env, string | null]>([
    [
      'mail, with nothing set',
      ['mail'],
      {},
      'To send e-mail (invitations, password resets, review notices), Coneline needs SMTP_HOST, MAIL_FROM, PUBLIC_URL (not set).',
    ],
    [
      'mail, with only the sender missing',
      ['mail'],
      { SMTP_HOST: 'smtp.school.example', PUBLIC_URL: 'https://coneline.school.example' },
      'To send e-mail (invitations, password resets, review notices), Coneline needs MAIL_FROM (not set).',
    ],
    [
      'mail, all set',
      ['mail'],
      {
        SMTP_HOST: 'smtp.school.example',
        MAIL_FROM: 'Coneline <coneline@school.example>',
        PUBLIC_URL: 'https://coneline.school.example',
      },
      null,
    ],
    [
      'storage, with only the keys missing',
      ['storage'],
      { S3_ENDPOINT: 'https://s3.school.example', S3_BUCKET: 'radiographs' },
      'To store radiographs, Coneline needs S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY (not set).',
    ],
    [
      'storage, all set',
      ['storage'],
      {
        S3_ENDPOINT: 'https://s3.school.example',
        S3_BUCKET: 'radiographs',
        S3_ACCESS_KEY_ID: 'id',
        S3_SECRET_ACCESS_KEY: 'key',
      },
      null,
    ],
  ])('once built, requires the settings of %s', (_name, features, env, expected) => {
    const problems = preflight({ AUTH_SECRET: SECRET, ...env }, { ...REAL, features });
    expect(problems).toEqual(expected ? [expected] : []);
  });
});

describe('isLoopback', () => {
  it.each([
    ['127.0.0.1', true],
    ['127.0.1.1', true],
    ['localhost', true],
    ['::1', true],
    ['[::1]', true],
    ['::ffff:127.0.0.1', true],
    ['0.0.0.0', false],
    ['::', false],
    ['', false],
    ['192.168.1.20', false],
    ['coneline.school.example', false],
  ])('%s → %s', (host, expected) => {
    expect(isLoopback(host)).toBe(expected);
  });
});
