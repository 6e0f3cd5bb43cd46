/** Plain words for stored codes, shared by the desktop pages and the tablet. */
export const SETTING_LABEL = { block: 'Training block', extracted: 'Extracted tooth', patient: 'Patient' } as const;
export const REVIEW_LABEL = {
  open: 'In progress',
  submitted: 'Waiting for review',
  approved: 'Signed off',
  returned: 'Returned',
} as const;
