/**
 * The password rules, in one place for account creation (users.ts, user:add), password changes
 * and resets. Server-only: the common-password list is about 380 KB and must never reach the
 * tablet's bundle.
 */
import { dictionary } from '@zxcvbn-ts/language-common';

export const MIN_PASSWORD_LENGTH = 12;
export const MAX_PASSWORD_LENGTH = 200;

let common: Set<string> | null = null;

/**
 * zxcvbn-ts's common-password list: about 49,000 passwords seen most often in the public
 * "ten million passwords" breach compilation, already lower-cased. Built on first use.
 */
function commonPasswords(): Set<string> {
  common ??= new Set(dictionary['passwords-common']);
  return common;
}

/**
 * Why the password may not be used, in words for the person choosing it, or null when it is
 * fine. Lengths count characters (code points), so an accented letter or an emoji is one.
 * @example passwordProblem('password1234') // 'That password is on a list of commonly used passwords; choose another.'
 */
export function passwordProblem(password: string): string | null {
  const length = [...password].length;
  if (length < MIN_PASSWORD_LENGTH) return `Use at least ${MIN_PASSWORD_LENGTH} characters.`;
  if (length > MAX_PASSWORD_LENGTH) return `Use at most ${MAX_PASSWORD_LENGTH} characters.`;
  if (password.trim() === '') return 'A password cannot be only spaces.';
  // Letter case and surrounding spaces add almost nothing against a guesser who tries the list.
  if (commonPasswords().has(password.trim().toLowerCase())) {
    return 'That password is on a list of commonly used passwords; choose another.';
  }
  return null;
}
