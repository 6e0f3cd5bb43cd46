/** Accounts: lookup, password checks, creation, session versions. */
import { hash, verify } from '@node-rs/argon2';
import type { Knex } from 'knex';
import { z } from 'zod';
import { audit } from './audit';
import { passwordProblem } from './password-policy';
import { ROLES, type Role } from '../contract';
import type { UserRow } from './tables';

export { MAX_PASSWORD_LENGTH, MIN_PASSWORD_LENGTH } from './password-policy';

export { ROLES };
export type { UserRow };
export type UserRole = Role;

export const newUserSchema = z.object({
  email: z.string().trim().toLowerCase().email('email must be an e-mail address'),
  name: z.string().trim().min(1, 'name is required').max(120, 'name must be at most 120 characters'),
  role: z.enum(ROLES, { errorMap: () => ({ message: 'role must be student, attending or director' }) }),
  password: z.string().superRefine((password, ctx) => {
    const problem = passwordProblem(password);
    if (problem) ctx.addIssue({ code: z.ZodIssueCode.custom, message: problem });
  }),
  cohortId: z.number().int().positive().nullable().optional(),
});
export type NewUser = z.infer<typeof newUserSchema>;

export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function findUserByEmail(k: Knex, email: string): Promise<UserRow | undefined> {
  return k('users').where({ email: email.trim().toLowerCase() }).first();
}

export async function findUserById(k: Knex, id: number): Promise<UserRow | undefined> {
  return k('users').where({ id }).first();
}

// A hash to verify against when the e-mail is unknown, so both failures take as long.
let decoyHash: Promise<string> | null = null;

/** The active user with this e-mail and password, or null. */
export async function checkPassword(k: Knex, email: string, password: string): Promise<UserRow | null> {
  const user = await findUserByEmail(k, email);
  decoyHash ??= hash('coneline-decoy-password');
  const stored = user?.password_hash ?? (await decoyHash);
  const ok = await verify(stored, password).catch(() => false);
  if (!user || !ok || !user.active || !user.password_hash) return null;
  return user;
}

/** Creates an account; throws a plain-worded Error on a duplicate e-mail. */
export async function createUser(k: Knex, input: NewUser, actorId: number | null = null): Promise<UserRow> {
  const u = newUserSchema.parse(input);
  if (await findUserByEmail(k, u.email)) throw new Error(`an account for ${u.email} already exists`);
  const password_hash = await hashPassword(u.password);
  // The account and its audit line are written together, or neither is.
  return k.transaction(async (trx) => {
    const [row] = await trx('users')
      .insert({ email: u.email, name: u.name, role: u.role, password_hash, cohort_id: u.cohortId ?? null })
      .returning('id');
    const id = row!.id;
    await audit(trx, actorId, 'user.created', 'user', String(id), { role: u.role });
    const created = await findUserById(trx, id);
    if (!created) throw new Error('the account was not stored');
    return created;
  });
}

export function toSessionUser(u: UserRow): SessionUser {
  return { id: u.id, email: u.email, name: u.name, role: u.role };
}
