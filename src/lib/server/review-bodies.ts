/** The zod bodies of the review routes (sign-off, reopen, comment); docs/review.md is their written form. */
import { z } from 'zod';
import {
  CASE_STATES,
  RATING_KEYS,
  REVIEW_TEXT_MAX,
  SIGNOFF_CHECKPOINTS,
  SIGNOFF_DECISIONS,
  type CanalRatings,
  type RatingKey,
} from '../rules/index';
import { UUID_RE } from './access';

const requestId = z.string().regex(UUID_RE, 'id must be a UUID made by the client for this request');
const uuid = (name: string) => z.string().regex(UUID_RE, `${name} must be a UUID`);
const text = (name: string, required: string) =>
  z
    .string({ required_error: required })
    .trim()
    .min(1, required)
    .max(REVIEW_TEXT_MAX, `${name} may be at most ${REVIEW_TEXT_MAX.toLocaleString('en')} characters`);

const level = z
  .number({ invalid_type_error: 'each rating must be a level from 1 to 4' })
  .int('each rating must be a level from 1 to 4')
  .min(1, 'each rating must be a level from 1 to 4')
  .max(4, 'each rating must be a level from 1 to 4');

const canalRatings = z
  .object(
    Object.fromEntries(RATING_KEYS.map((k) => [k, level.optional()])) as Record<RatingKey, z.ZodOptional<typeof level>>,
  )
  .strict() as unknown as z.ZodType<CanalRatings>;

export const signoffSchema = z
  .object({
    id: requestId,
    checkpoint: z.enum(SIGNOFF_CHECKPOINTS),
    canalId: uuid('canalId').optional(),
    decision: z.enum(SIGNOFF_DECISIONS),
    ratings: z.record(uuid('each ratings key (a canal id)'), canalRatings).optional(),
    comment: text('comment', 'a return needs a comment saying what to put right').optional(),
    expectedState: z.enum(CASE_STATES),
  })
  .strict()
  .superRefine((b, ctx) => {
    if (b.checkpoint === 'final' && b.canalId !== undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['canalId'],
        message: 'a final sign-off is of the whole case: send no canalId',
      });
    if (b.checkpoint !== 'final' && b.canalId === undefined)
      ctx.addIssue({
        code: 'custom',
        path: ['canalId'],
        message: `a ${b.checkpoint} sign-off needs the canalId it is of`,
      });
    if (b.decision === 'return' && b.comment === undefined)
      ctx.addIssue({ code: 'custom', path: ['comment'], message: 'a return needs a comment saying what to put right' });
  });
export type SignoffInput = z.infer<typeof signoffSchema>;

export const reopenSchema = z
  .object({
    id: requestId,
    reason: text('reason', 'say why the case is reopened'),
    // Optional: the state the attending saw, as on a sign-off (409 when it changed).
    expectedState: z.enum(CASE_STATES).optional(),
  })
  .strict();
export type ReopenInput = z.infer<typeof reopenSchema>;

export const commentSchema = z
  .object({
    id: requestId,
    canalId: uuid('canalId').optional(),
    eventId: uuid('eventId').optional(),
    text: text('text', 'a comment needs some text'),
  })
  .strict();
export type CommentInput = z.infer<typeof commentSchema>;
