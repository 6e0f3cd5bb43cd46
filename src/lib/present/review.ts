// Words for review codes: checkpoints, decisions, what a canal is rated on and the levels.
// The level names are Coneline's own, written for teaching feedback.
import type { RatingKey, RatingLevel, SignoffCheckpoint, SignoffOutcome } from '../rules/core';

export const CHECKPOINT_LABEL: Readonly<Record<SignoffCheckpoint, string>> = {
  'cone-fit': 'Cone fit',
  'fill-check': 'Fill check',
  final: 'Whole case',
};

export const SIGNOFF_OUTCOME_LABEL: Readonly<Record<SignoffOutcome, string>> = {
  approved: 'Approved',
  returned: 'Returned',
  reopened: 'Reopened',
};

export const RATING_KEY_LABEL: Readonly<Record<RatingKey, string>> = {
  fillLength: 'Fill length',
  density: 'Density',
  taper: 'Taper',
  searLevel: 'Sear level',
  technique: 'Technique',
};

/** 1 to 4, lowest first. */
export const RATING_LEVEL_LABEL: Readonly<Record<RatingLevel, string>> = {
  1: 'Not yet',
  2: 'Getting there',
  3: 'Sound',
  4: 'Exemplary',
};
