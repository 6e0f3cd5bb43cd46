// The review page's form schemas (zod, through react-hook-form's resolver). The server reads the
// same bodies with its own schemas (src/lib/server/review-bodies.ts); these say what is missing
// beside the field before anything is sent.
import { z } from 'zod';
import { REVIEW_TEXT_MAX, SIGNOFF_CHECKPOINTS, SIGNOFF_DECISIONS } from '../../lib/rules/review';

export const TEXT_MAX_WORDS = REVIEW_TEXT_MAX.toLocaleString('en');

const text = (missing: string) =>
  z.string().trim().min(1, missing).max(REVIEW_TEXT_MAX, `At most ${TEXT_MAX_WORDS} characters.`);

export const commentForm = z.object({ text: text('Write the comment first.') });
export type CommentForm = z.infer<typeof commentForm>;

/** A rating as its select holds it: "" for not rated, or a level "1" to "4". */
const level = z.enum(['', '1', '2', '3', '4']);

export const signoffForm = z
  .object({
    checkpoint: z.enum(SIGNOFF_CHECKPOINTS),
    canalId: z.string(),
    decision: z.enum(SIGNOFF_DECISIONS, { errorMap: () => ({ message: 'Choose approve or return.' }) }),
    ratings: z.record(z.record(level)),
    comment: z.string().trim().max(REVIEW_TEXT_MAX, `At most ${TEXT_MAX_WORDS} characters.`),
  })
  .superRefine((v, ctx) => {
    if (v.checkpoint !== 'final' && v.canalId === '')
      ctx.addIssue({ code: 'custom', path: ['canalId'], message: 'Choose the canal this sign-off is of.' });
    if (v.decision === 'return' && v.comment === '')
      ctx.addIssue({
        code: 'custom',
        path: ['comment'],
        message: 'A return needs a comment saying what to put right.',
      });
  });
export type SignoffForm = z.input<typeof signoffForm>;

export const reopenForm = z.object({ reason: text('Say why the case is reopened.') });
export type ReopenForm = z.infer<typeof reopenForm>;
