/**
 * The course settings as they cross the wire and reach the forms (docs/settings.md): every
 * setting's name, words, range, default and source, the answer of GET /api/settings, and the
 * zod bodies of PUT /api/settings and the settings form. Pure: no I/O. Not for the chairside
 * island (zod): the tablet reads the answer's tolerances through the rules core.
 */
import { z } from 'zod';
import { DEFAULT_TOLERANCES, TOLERANCE_LABELS, TOLERANCE_RANGES, type Tolerances } from './rules/tolerances';

export type SettingGroup = 'tolerance' | 'requirement' | 'policy';

export interface SettingDef {
  default: number;
  /** The range a director may set it within, inclusive. */
  min: number;
  max: number;
  /** Whole numbers only (counts, and 0/1 for yes/no). */
  whole: boolean;
  /** One sentence: what it is and what it changes. */
  doc: string;
  /** Its name in words, as the settings page shows it; the doc stands in when absent. */
  label?: string;
  /** The unit its value is in ('mm', 'canals', 'cones'); none for a yes/no setting. */
  unit?: string;
  /** The form's step; 1 for whole numbers and 0.1 otherwise when absent. */
  step?: number;
}

/** The source shown for every setting the school decides alone: requirements and yes/no policies. */
export const SCHOOL_POLICY = 'school policy';

const TOLERANCE_WORDS: Readonly<Record<keyof Tolerances, { label: string; unit: string; step: number }>> = {
  cwlUnusualMarginMm: {
    label: 'How far a CWL may lie from the average length of its tooth type before a note',
    unit: 'mm',
    step: 0.5,
  },
  taperShortMarginMm: { label: 'How far short of the CWL the taper-check spreader may stop', unit: 'mm', step: 0.1 },
  masterLengthMarginMm: { label: 'How far short of the CWL the master cone may be fitted', unit: 'mm', step: 0.1 },
  coneFitRetakeThresholdMm: {
    label: 'Change of the master cone’s length that calls for a new cone-fit radiograph',
    unit: 'mm',
    step: 0.1,
  },
  firstSpreaderMarginMm: {
    label: 'How far short of the CWL the first spreader placement may stop',
    unit: 'mm',
    step: 0.1,
  },
  accessoryLengthMarginMm: {
    label: 'How far an accessory cone’s length may differ from the spreader depth',
    unit: 'mm',
    step: 0.1,
  },
  minAccessoryCones: { label: 'Fewest accessory cones at sear-off before a note', unit: 'cones', step: 1 },
  fallbackStopDepthMm: {
    label: 'Depth from the reference point where compaction may stop when no orifice depth was recorded',
    unit: 'mm',
    step: 0.5,
  },
  fillShortLimitMm: { label: 'How far short of the radiographic apex a fill may end', unit: 'mm', step: 0.1 },
  requireConeFitApproval: {
    label: 'An attending approves the cone fit before the master cone is sealed (1 yes, 0 no)',
    unit: '',
    step: 1,
  },
};

const requirement = (fallback: number, label: string, doc: string): SettingDef => ({
  default: fallback,
  min: 0,
  max: 50,
  whole: true,
  unit: 'canals',
  step: 1,
  label,
  doc,
});

/**
 * Every setting: the tolerances of the checks (src/lib/rules/tolerances.ts, their ranges and
 * defaults), then the graduation requirements, by tooth group and by setting. A canal counts
 * towards its tooth group (FDI x1–x3, x4–x5, x6–x8, when its case names a tooth) and towards
 * its case's setting; a student meets the requirements when every count is reached.
 */
export const SETTING_DEFS = Object.freeze({
  ...(Object.fromEntries(
    (Object.keys(DEFAULT_TOLERANCES) as (keyof Tolerances)[]).map((key) => [
      key,
      {
        default: DEFAULT_TOLERANCES[key],
        ...TOLERANCE_RANGES[key],
        whole: key === 'minAccessoryCones' || key === 'requireConeFitApproval',
        doc: `A tolerance of the checks (docs/rules.md, "Tolerances").`,
        ...TOLERANCE_WORDS[key],
      },
    ]),
  ) as Record<keyof Tolerances, SettingDef>),
  requiredAnteriorCanals: requirement(
    4,
    'Anterior canals to complete (FDI x1–x3)',
    'Anterior canals to complete before graduation.',
  ),
  requiredPremolarCanals: requirement(
    4,
    'Premolar canals to complete (FDI x4–x5)',
    'Premolar canals to complete before graduation.',
  ),
  requiredMolarCanals: requirement(
    6,
    'Molar canals to complete (FDI x6–x8)',
    'Molar canals to complete before graduation.',
  ),
  requiredBlockCanals: requirement(
    6,
    'Canals to complete on training blocks',
    'Canals on training blocks to complete before graduation.',
  ),
  requiredExtractedCanals: requirement(
    6,
    'Canals to complete on extracted teeth',
    'Canals on extracted teeth to complete before graduation.',
  ),
  requiredPatientCanals: requirement(
    4,
    'Canals to complete on patients',
    'Canals on patients to complete before graduation.',
  ),
}) satisfies Record<string, SettingDef>;

export type SettingName = keyof typeof SETTING_DEFS;
export type SettingValues = Record<SettingName, number>;
export const SETTING_NAMES = Object.keys(SETTING_DEFS) as SettingName[];

const DEFS: Readonly<Record<string, SettingDef>> = SETTING_DEFS;

export function isSettingName(name: string): name is SettingName {
  return Object.hasOwn(SETTING_DEFS, name);
}

/** True for a yes/no setting: whole, from 0 to 1. */
export function isYesNo(d: SettingDef): boolean {
  return d.whole && d.min === 0 && d.max === 1;
}

/** The group a setting belongs to: a tolerance of the checks, a graduation requirement, another policy. */
export function settingGroup(name: SettingName): SettingGroup {
  if (Object.hasOwn(DEFAULT_TOLERANCES, name)) return 'tolerance';
  return name.startsWith('required') && !isYesNo(DEFS[name]!) ? 'requirement' : 'policy';
}

/**
 * Where a setting's default comes from, as docs/references.md labels it: "trade teaching
 * (practice)" for a tolerance, "school policy" for the rest.
 */
export function settingSource(name: SettingName): string {
  // A yes/no setting is the school's choice, even where the rules core holds it.
  if (!Object.hasOwn(TOLERANCE_LABELS, name) || isYesNo(DEFS[name]!)) return SCHOOL_POLICY;
  const s = TOLERANCE_LABELS[name as keyof Tolerances];
  return `${s.source} (${s.label})`;
}

/** The form's step for a setting. */
export function settingStep(d: SettingDef): number {
  return d.step ?? (d.whole ? 1 : 0.1);
}

/** A value with its unit, as the page and the doc write it: "0.5 mm", "4 canals", "yes". */
export function settingValueText(d: SettingDef, value: number): string {
  if (isYesNo(d)) return value === 1 ? 'yes' : 'no';
  return d.unit ? `${value} ${d.unit}` : String(value);
}

/** The range in words: "0–3 mm", "0 (no) or 1 (yes)". */
export function settingRangeText(d: SettingDef): string {
  if (isYesNo(d)) return '0 (no) or 1 (yes)';
  return `${d.min}–${d.max}${d.unit ? ` ${d.unit}` : ''}`;
}

/** The refusal of a value out of range, naming the field and the range. */
export function rangeError(name: string, d: SettingDef): string {
  if (isYesNo(d)) return `${name} must be 0 (no) or 1 (yes)`;
  const unit = d.unit ? ` ${d.unit}` : '';
  return d.whole
    ? `${name} must be a whole number from ${d.min} to ${d.max}${unit}`
    : `${name} must lie between ${d.min} and ${d.max}${unit}`;
}

/** Why `value` may not be stored for `name`, or null when it may. */
export function settingError(name: string, value: unknown): string | null {
  if (!isSettingName(name)) return `${name} is not a setting`;
  const d = DEFS[name]!;
  if (typeof value !== 'number' || !Number.isFinite(value)) return `${name} must be a number`;
  if (d.whole && !Number.isInteger(value)) return rangeError(name, d);
  if (value < d.min || value > d.max) return rangeError(name, d);
  return null;
}

/** One setting's value as zod checks it, each refusal naming the field and its range. */
function valueSchema(name: string, d: SettingDef) {
  const range = rangeError(name, d);
  const base = z
    .number({ required_error: `${name} is required`, invalid_type_error: `${name} must be a number` })
    .finite(`${name} must be a number`);
  return (d.whole ? base.int(range) : base).min(d.min, range).max(d.max, range);
}

type ValueSchema = ReturnType<typeof valueSchema>;

/** Every setting, all required: the settings form's schema (react-hook-form, zod resolver). */
export const settingsFormSchema = z
  .object(
    Object.fromEntries(SETTING_NAMES.map((n) => [n, valueSchema(n, DEFS[n]!)])) as Record<SettingName, ValueSchema>,
  )
  .strict();

/** Any of the settings, by name; unknown names are refused. */
export const settingValuesSchema = settingsFormSchema
  .partial()
  .strict()
  .refine((v) => Object.keys(v).length > 0, { message: 'values must name at least one setting' });

/** The body of PUT /api/settings; the version the change is made to comes in `If-Match`. */
export const settingsPutSchema = z
  .object({
    id: z
      .string({ required_error: 'id is required' })
      .regex(
        /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i,
        'id must be a UUID made by the client for this request',
      ),
    values: settingValuesSchema,
  })
  .strict();
export type SettingsPut = z.infer<typeof settingsPutSchema>;

/** The body of POST /api/settings/recompute. */
export const recomputePostSchema = settingsPutSchema.pick({ id: true }).strict();

/** The setting a zod refusal is about (the `field` of the 400 answer), when it names one. */
export function settingsErrorField(err: z.ZodError): string | undefined {
  const issue = err.issues[0];
  if (!issue) return undefined;
  if (issue.code === z.ZodIssueCode.unrecognized_keys) return issue.keys[0];
  const last = issue.path.at(-1);
  return typeof last === 'string' ? last : undefined;
}

/** One setting as the settings page shows it (words, range, default, source). */
export interface SettingRowView {
  name: SettingName;
  label: string;
  group: SettingGroup;
  value: number;
  default: number;
  min: number;
  max: number;
  step: number;
  whole: boolean;
  yesNo: boolean;
  unit: string;
  /** "0–3 mm", "0 (no) or 1 (yes)". */
  range: string;
  defaultText: string;
  /** "Trade teaching (practice)", "school policy", … */
  source: string;
  /** Why the default is what it is, where the rules core says (tolerances only). */
  sourceNote: string | null;
}

/** GET /api/settings, and the answer of a PUT: every setting by name, and the version (also the ETag). */
export type SettingsAnswer = { version: number } & SettingValues;

/** The answer of 409 to a PUT made to an older version. */
export interface StaleSettingsAnswer {
  error: string;
  code: 'stale';
  /** The version in force now. */
  version: number;
}

/** GET /api/settings/recompute: how far the background re-judging has come. */
export interface RecomputeStatus {
  /** Whether a re-judging is running in this server now. */
  running: boolean;
  /** Unlocked canals judged by the rules and settings in force, of all unlocked canals. */
  done: number;
  total: number;
  /** When the re-judging towards the current rules and settings began and ended; null before. */
  startedAt: string | null;
  finishedAt: string | null;
  settingsVersion: number;
  rulesVersion: number;
}
