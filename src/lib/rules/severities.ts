// The severity of every finding, in the order of docs/rules.md's table: the one list of finding
// codes, and how a check raises a finding. Apart from the catalogue (findings.ts) so that the
// browser, which raises findings but never shows the catalogue's prose, does not load it.
export type Severity = 'stop' | 'caution' | 'note';

export const SEVERITY = {
  'cwl-unusual-for-tooth': 'note',
  'cwl-corrected-without-reason': 'note',
  'seat-not-confirmed': 'stop',
  'seat-file-not-maf': 'caution',
  'taper-not-checked': 'caution',
  'taper-short': 'stop',
  'taper-beyond-cwl': 'caution',
  'maf-radiograph-missing': 'caution',
  'final-rinse-incomplete': 'caution',
  'paper-point-long': 'stop',
  'master-size-mismatch': 'caution',
  'master-length-mismatch': 'stop',
  'master-beyond-cwl': 'stop',
  'cone-fit-radiograph-missing': 'caution',
  'cone-fit-retake-needed': 'caution',
  'cone-fit-not-approved': 'stop',
  'compaction-before-seat': 'caution',
  'spreader-beyond-cwl': 'stop',
  'first-spreader-short': 'caution',
  'accessory-without-spreader': 'caution',
  'accessory-length-mismatch': 'caution',
  'accessory-short': 'stop',
  'accessory-beyond-cwl': 'stop',
  'accessory-size-mismatch': 'note',
  'compaction-incomplete': 'caution',
  'few-accessory-cones': 'note',
  'fill-check-radiograph-missing': 'caution',
  'fill-short': 'caution',
  'fill-beyond': 'stop',
  'fill-voids': 'stop',
  'sear-above-cej': 'caution',
  'sear-level-missing': 'caution',
  'restoration-missing': 'caution',
  'postop-radiograph-missing': 'caution',
} as const satisfies Record<string, Severity>;

export type FindingCode = keyof typeof SEVERITY;

export interface Finding {
  code: FindingCode;
  severity: Severity;
  /** The event that raised it, where there is one. */
  eventId?: string;
  message: string;
}

/** A finding of `code` with its severity. */
export function raise(code: FindingCode, message: string, eventId?: string): Finding {
  const f: Finding = { code, severity: SEVERITY[code], message };
  if (eventId !== undefined) f.eventId = eventId;
  return f;
}
