/** A user's choice of review notices: one e-mail each (the default) or one daily digest. */
import type { Knex } from 'knex';
import { z } from 'zod';
import { UUID_RE } from './access';
import { audit } from './audit';
import type { Answer } from './request-ids';

export const mailPreferenceSchema = z
  .object({
    id: z.string().regex(UUID_RE, 'id must be a UUID made by the client for this request'),
    digest: z.boolean({ required_error: 'digest is required', invalid_type_error: 'digest must be true or false' }),
  })
  .strict();
export type MailPreference = z.infer<typeof mailPreferenceSchema>;

/** Whether `userId` takes the daily digest. */
export async function takesDigest(k: Knex, userId: number): Promise<boolean> {
  const row = await k('users').where({ id: userId }).first('mail_digest');
  return Boolean(row?.mail_digest);
}

/**
 * Sets the signed-in user's choice. Notices already held wait for the next digest either way;
 * notices from now on follow the new choice.
 */
export async function setMailPreference(k: Knex, userId: number, input: MailPreference): Promise<Answer> {
  await k.transaction(async (trx) => {
    await trx('users').where({ id: userId }).update({ mail_digest: input.digest });
    await audit(trx, userId, 'user.mail-preference', 'user', String(userId), { digest: input.digest });
  });
  return { status: 200, body: { digest: input.digest } };
}
