// The review's vocabulary: what an attending signs off, how, and what a canal is rated on.
// Codes only; the words are in src/lib/present/review.ts.

/** A canal's cone fit or fill check, or the whole case. */
export const SIGNOFF_CHECKPOINTS = ['cone-fit', 'fill-check', 'final'] as const;
export type SignoffCheckpoint = (typeof SIGNOFF_CHECKPOINTS)[number];
export const SIGNOFF_DECISIONS = ['approve', 'return'] as const;
export type SignoffDecision = (typeof SIGNOFF_DECISIONS)[number];
/** A stored sign-off's decision: a reopening is kept as a sign-off row too. */
export type SignoffOutcome = 'approved' | 'returned' | 'reopened';

/** What a canal is rated on; each rating is a level 1–4. */
export const RATING_KEYS = ['fillLength', 'density', 'taper', 'searLevel', 'technique'] as const;
export type RatingKey = (typeof RATING_KEYS)[number];
export const RATING_LEVELS = [1, 2, 3, 4] as const;
export type RatingLevel = (typeof RATING_LEVELS)[number];
export type CanalRatings = Partial<Record<RatingKey, RatingLevel>>;

/** The longest comment, return reason or reopening reason, in characters (after trimming). */
export const REVIEW_TEXT_MAX = 2000;
