// Coneline's rules core without zod: event reading, checks, derived state, trade tables and
// calculators. The browser imports this file (the chairside island validates each tap with
// parseEvent), so nothing reachable from here may import zod: zod 3 is about 14 KB gzipped of
// the island's budget. tests/lib/rules/reference-doc.test.ts bundles it to make sure.
// index.ts adds formatZodError (for form and API bodies) for the server and the tests.
export {
  EVENT_TYPES,
  CASE_LEVEL_ONLY,
  CASE_OR_CANAL,
  SETTINGS,
  SEALERS,
  RADIOGRAPH_PURPOSES,
  FILL_LENGTHS,
} from './events';
export type { EventType, LogEvent, EventOf, RadiographPurpose } from './events';
export { SOLUTIONS } from './fields';
export { parseEvent, canonicalEvent } from './parse';
export { LIMITS, LIMIT_MESSAGES, CaseTally, tallyOf, tallyEvent } from './limits';
export type { CaseLimit, LimitBreach, TallyEvent } from './limits';
export {
  DEFAULT_TOLERANCES,
  TOLERANCE_LABELS,
  TOLERANCE_SOURCES,
  TOLERANCE_RANGES,
  resolveTolerances,
  toleranceInRange,
} from './tolerances';
export { RULES_VERSION } from './version';
export {
  CASE_STATES,
  CASE_ACTIONS,
  TRANSITIONS,
  CASE_STATE_LABELS,
  REVIEW_STATES_SHOWN_ON_CANALS,
  next,
  isRefusal,
  isCaseState,
  isLocked,
  finalApprovalRefusal,
} from './lifecycle';
export type { CaseState, CaseAction, Refusal as LifecycleRefusal, ApprovalBlockers } from './lifecycle';
export type { Tolerances } from './tolerances';
export { SIGNOFF_CHECKPOINTS, SIGNOFF_DECISIONS, RATING_KEYS, RATING_LEVELS, REVIEW_TEXT_MAX } from './review';
export type {
  SignoffCheckpoint,
  SignoffDecision,
  SignoffOutcome,
  RatingKey,
  RatingLevel,
  CanalRatings,
} from './review';
export { SOURCE_LABELS, LABEL_MEANINGS } from './labels';
export type { SourceLabel, Sourced, LabelledValue } from './labels';
export { referenceValues } from './reference-values';
export { FINDINGS, FINDING_CODES, SAFETY_LINE } from './findings';
export type { Severity, FindingCode, Finding, FindingInfo } from './findings';
export { evaluateCanal, readCanal } from './evaluate';
export type { CanalResult, CanalReading } from './evaluate';
export { caseTimeline, compareEvents } from './timeline';
export type { CanalState, CanalStatus } from './state';
export {
  canalThirds,
  isCompactionComplete,
  fallbackStopDepthFor,
  STOP_DEPTH_REFERENCE_LENGTH_MM,
  STOP_DEPTH_SCALING_SOURCE,
} from './thirds';
export type { CanalThirds } from './thirds';
export {
  ISO_SIZES,
  NON_STANDARD_SIZES,
  isIsoSize,
  isConeSize,
  normaliseSize,
  isoColour,
  tipDiameterMm,
  diameterAtMm,
} from './sizes';
export type { IsoColourName } from './sizes';
export { isValidFdi, fdiToUniversal, universalToFdi, toothGroup, toothName } from './teeth';
export type { ToothGroup, ToothKind } from './teeth';
export {
  usualCanals,
  pickCanal,
  referencePointsFor,
  averageLengthMm,
  SINGLE_CANAL,
  SECOND_CANAL_PAIR,
  AVERAGE_LENGTHS,
} from './anatomy';
export type { AverageLength } from './anatomy';
export {
  workingLengthByDiscrepancy,
  workingLengthFromApexLocator,
  proportionalLength,
  workingLengthByProportion,
  resorptionAllowanceMm,
  RESORPTIONS,
  stepBackSchedule,
  roundToHalf,
  roundToHundredth,
  floorToHalf,
  APEX_LOCATOR_BACK_OFF_MM,
  ISO_CUTTING_LENGTH_MM,
  isoSizeRow,
} from './calculators';
export type { Resorption, IsoSizeRow } from './calculators';
export { CALCULATOR_VALUES, ROUNDING_VALUE, calculatorSources } from './calculator-sources';
export type { CalculatorId } from './calculator-sources';
