// Coneline's rules core without zod: event reading, checks, derived state, trade tables and
// calculators. The browser imports this file (the chairside island validates each tap with
// parseEvent), so nothing reachable from here may import zod: zod 3 is about 14 KB gzipped of
// the island's budget. tests/lib/rules/reference-doc.test.ts bundles it to make sure.
// index.ts adds the zod schema and formatZodError for the server and the tests.
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
export { DEFAULT_TOLERANCES, TOLERANCE_SOURCES, resolveTolerances } from './tolerances';
export type { Tolerances } from './tolerances';
export { FINDINGS, FINDING_CODES, SAFETY_LINE } from './findings';
export type { Severity, FindingCode, Finding, FindingInfo } from './findings';
export { evaluateCanal, readCanal } from './evaluate';
export type { CanalResult, CanalReading } from './evaluate';
export { caseTimeline, compareEvents } from './timeline';
export type { CanalState, CanalStatus } from './state';
export { canalThirds, isCompactionComplete } from './thirds';
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
export { usualCanals, referencePointsFor, averageLengthMm, SINGLE_CANAL } from './anatomy';
export {
  workingLengthByDiscrepancy,
  workingLengthFromApexLocator,
  proportionalLength,
  stepBackSchedule,
  roundToHalf,
  roundToHundredth,
} from './calculators';
