/** Plain words for stored codes, shared by the desktop pages and the tablet. */
export const SETTING_LABEL = { block: 'Training block', extracted: 'Extracted tooth', patient: 'Patient' } as const;
export { CASE_STATE_LABELS as REVIEW_LABEL } from '../../lib/rules/lifecycle';
