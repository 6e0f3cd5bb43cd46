import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH, passwordProblem } from '../../../src/lib/server/password-policy';
import { newUserSchema } from '../../../src/lib/server/users';
import { ROOT } from '../../helpers/paths';

const TOO_SHORT = `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
const TOO_LONG = `Use at most ${MAX_PASSWORD_LENGTH} characters.`;
const BLANK = 'A password cannot be only spaces.';
const COMMON = 'That password is on a list of commonly used passwords; choose another.';

describe('passwordProblem', () => {
  it.each([
    ['11 characters', 'x'.repeat(10) + '7', TOO_SHORT],
    ['12 characters', 'x'.repeat(11) + '7', null],
    ['200 characters', 'x'.repeat(199) + '7', null],
    ['201 characters', 'x'.repeat(200) + '7', TOO_LONG],
    ['an empty password', '', TOO_SHORT],
    ['12 spaces', ' '.repeat(12), BLANK],
    ['tabs, spaces and new lines only', ' \t\n'.repeat(5), BLANK],
    ['a listed password', 'password1234', COMMON],
    ['a listed password in capitals', 'PassWord1234', COMMON],
    ['another listed password', '1q2w3e4r5t6y', COMMON],
    ['a listed password with a space around it', ' qazwsxedcrfv ', COMMON],
    ['a long unlisted passphrase', 'amalgam-spreader-cwl-19.5mm', null],
  ])('%s: %j', (_label, password, expected) => {
    expect(passwordProblem(password)).toBe(expected);
  });

  it('counts characters, not UTF-16 units: 12 accented or emoji characters are enough', () => {
    expect(passwordProblem('é'.repeat(11))).toBe(TOO_SHORT);
    expect(passwordProblem('🦷'.repeat(12))).toBeNull();
    expect(passwordProblem('🦷'.repeat(200))).toBeNull();
  });

  it('stays on the server: nothing the browser loads holds the list (the built client)', () => {
    const files = readdirSync(join(ROOT, 'dist/client'), { recursive: true, encoding: 'utf8' }).filter((f) =>
      /\.(m?js|html)$/.test(f),
    );
    expect(files.length).toBeGreaterThan(0);
    const holding = files.filter((f) =>
      /zxcvbn|passwords-common|qwertyuiop/.test(readFileSync(join(ROOT, 'dist/client', f), 'utf8')),
    );
    expect(holding).toEqual([]);
  });
});

describe('newUserSchema', () => {
  const user = { email: 'new@example.org', name: 'New Person', role: 'student' as const };

  it('refuses a listed password with the policy message, so createUser and user:add enforce it', () => {
    const r = newUserSchema.safeParse({ ...user, password: 'Password1234' });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => i.message)).toEqual([COMMON]);
  });

  it('accepts a password the policy accepts', () => {
    expect(newUserSchema.safeParse({ ...user, password: 'amalgam-spreader-cwl-19.5mm' }).success).toBe(true);
  });
});
