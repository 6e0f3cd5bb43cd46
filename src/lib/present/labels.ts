// Plain words for every stored code a screen may show. The rules core and the database keep
// the codes; only this module turns them into words, for the tablet and the desktop pages alike.
import type { CanalStatus, EventType, RadiographPurpose, Severity } from '../rules/core';

/** A screen's word for a code that is not in a table: the code's words, never the code itself. */
export function plainWords(code: string): string {
  const words = code
    .replace(/([a-z])([A-Z])/g, '$1 $2')
    .replace(/[-_.]+/g, ' ')
    .trim()
    .toLowerCase();
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** "epoxy resin" → "Epoxy resin": a label at the start of a line or on a chip. */
export const capitalise = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);

const look = (table: Readonly<Record<string, string>>, code: string): string =>
  Object.hasOwn(table, code) ? table[code]! : plainWords(code);

export const SETTING_LABEL = { block: 'Training block', extracted: 'Extracted tooth', patient: 'Patient' } as const;

/** The case's review state. */
export const REVIEW_LABEL = {
  open: 'In progress',
  submitted: 'Waiting for review',
  approved: 'Signed off',
  returned: 'Returned',
} as const;

/** A canal's status: the rules' steps, the review states the server puts in their place, and a removed canal. */
export const CANAL_STATUS_LABEL: Readonly<Record<CanalStatus | 'approved' | 'returned' | 'removed', string>> = {
  'set-up': 'set up',
  verified: 'verified',
  'cone-fitted': 'cone fitted',
  compacting: 'compacting',
  filled: 'filled',
  seared: 'seared',
  restored: 'restored',
  submitted: 'submitted',
  approved: 'signed off',
  returned: 'returned',
  removed: 'withdrawn',
};

/** The word for a canal that has no seated master cone (it may be at any status before that, or submitted). */
export const UNFILLED_LABEL = 'unfilled';

/**
 * Whether a canal is unfilled: no master cone was ever seated. A state stored before rules
 * version 2 has no `unfilled`; its master cone's `seated` answers instead.
 */
export function isUnfilled(state: { unfilled?: boolean; masterCone: { seated: boolean } | null }): boolean {
  return state.unfilled ?? !(state.masterCone?.seated ?? false);
}

/** A canal's status for a heading: "seared", or "submitted, unfilled" for a canal never filled. */
export function canalStatusLine(state: {
  status: string;
  unfilled?: boolean;
  masterCone: { seated: boolean } | null;
}): string {
  const status = canalStatusLabel(state.status);
  if (!isUnfilled(state)) return status;
  // Before the cone is seated the status already says how far the canal got.
  return state.status === 'submitted' ||
    state.status === 'restored' ||
    state.status === 'seared' ||
    state.status === 'filled'
    ? `${status}, ${UNFILLED_LABEL}`
    : `${status} (${UNFILLED_LABEL})`;
}
export const canalStatusLabel = (status: string): string => look(CANAL_STATUS_LABEL, status);

/** What each event type records, as a reader would name it. */
export const EVENT_TYPE_LABEL: Readonly<Record<EventType, string>> = {
  'case.opened': 'Case opened',
  'canal.added': 'Canal set up',
  'canal.cwlCorrected': 'CWL corrected',
  'seat.checked': 'MAF seat check',
  'taper.checked': 'Taper check',
  'radiograph.taken': 'Radiograph',
  'canal.rinsed': 'Final rinse',
  'canal.dried': 'Paper points',
  'master.fitted': 'Master cone fitted',
  'master.seated': 'Master cone seated',
  'spreader.placed': 'Spreader placed',
  'accessory.placed': 'Accessory cone placed',
  'accessory.removed': 'Short cone removed',
  'fill.assessed': 'Fill check',
  'gp.seared': 'Seared off',
  'gp.compacted': 'Vertical compaction',
  'chamber.cleaned': 'Chamber cleaned',
  'access.restored': 'Access restored',
  'note.added': 'Note',
  'event.voided': 'Withdrawn',
  'case.submitted': 'Submitted for review',
  'compaction.finished': 'Compaction finished',
  'case.discarded': 'Case discarded',
  'conefit.requested': 'Cone-fit check asked for',
  'conefit.approvedAtChair': 'Cone fit approved at the chair',
};
export const eventTypeLabel = (type: string): string => look(EVENT_TYPE_LABEL, type);

export const RADIOGRAPH_PURPOSE_LABEL: Readonly<Record<RadiographPurpose, string>> = {
  'working-length': 'working length',
  maf: 'MAF',
  'cone-fit': 'cone fit',
  'fill-check': 'fill check',
  'post-op': 'postoperative',
};
export const purposeLabel = (purpose: string): string => look(RADIOGRAPH_PURPOSE_LABEL, purpose);

export const SEALER_LABEL = {
  zoe: 'ZOE',
  'epoxy-resin': 'epoxy resin',
  'calcium-silicate': 'calcium silicate',
  'calcium-hydroxide': 'calcium hydroxide',
  other: 'other',
} as const;
export const sealerLabel = (sealer: string): string => look(SEALER_LABEL, sealer);

export const SOLUTION_LABEL = { naocl: 'NaOCl', edta: 'EDTA', saline: 'saline', chlorhexidine: 'CHX' } as const;
export const solutionLabel = (solution: string): string => look(SOLUTION_LABEL, solution);

/** A canal's preparation: "Step-back", or a taper such as "Taper 0.04". */
export function preparationLabel(preparation: string): string {
  if (preparation === 'step-back') return 'Step-back';
  return /^0\.\d\d$/.test(preparation) ? `Taper ${preparation}` : plainWords(preparation);
}

export const FILL_LABEL = {
  flush: 'flush',
  'short-0-2': '0–2 mm short',
  'short-over-2': 'over 2 mm short',
  beyond: 'beyond the apex',
} as const;
export const SEAT_LABEL = { seated: 'seats and holds', advances: 'goes past', short: 'short of length' } as const;
export const POINT_SIZE_LABEL = { fine: 'fine', medium: 'medium', coarse: 'coarse' } as const;
export const RESTORATION_LABEL = { temporary: 'temporary', permanent: 'permanent' } as const;
export const ROLE_LABEL = { student: 'Student', attending: 'Attending', director: 'Course director' } as const;

export const fillLabel = (v: string): string => look(FILL_LABEL, v);
export const seatLabel = (v: string): string => look(SEAT_LABEL, v);
export const pointSizeLabel = (v: string): string => look(POINT_SIZE_LABEL, v);
export const restorationLabel = (v: string): string => look(RESTORATION_LABEL, v);
export const roleLabel = (v: string): string => look(ROLE_LABEL, v);
export const settingLabel = (v: string): string => look(SETTING_LABEL, v);
export const reviewLabel = (v: string): string => look(REVIEW_LABEL, v);

/** The severity's word; colour never stands alone. */
export const SEVERITY_WORD: Readonly<Record<Severity, string>> = { stop: 'Stop', caution: 'Caution', note: 'Note' };
/** Stops first, then cautions, then notes. */
export const SEVERITY_ORDER: Readonly<Record<Severity, number>> = { stop: 0, caution: 1, note: 2 };
/** Findings in the order a reader should see them. */
export function bySeverity<T extends { severity: Severity }>(list: readonly T[]): T[] {
  return [...list].sort((a, b) => SEVERITY_ORDER[a.severity] - SEVERITY_ORDER[b.severity]);
}
export const severityWord = (v: string): string => look(SEVERITY_WORD, v);

/**
 * A canal's name as a heading: "MB canal", "Main canal". A name that already says canal (a
 * training block's "Canal") stays as it is, so no heading reads "Canal Canal".
 */
export function canalTitle(name: string): string {
  return /canal/i.test(name) ? name : `${name} canal`;
}

/**
 * A tooth as a heading: "Tooth 36", or with its Universal number "Tooth 36 (Universal 19)".
 * The caller passes the Universal number (the rules core's fdiToUniversal) when it is shown.
 */
export function toothTitle(fdi: number, universal?: string): string {
  return universal ? `Tooth ${fdi} (Universal ${universal})` : `Tooth ${fdi}`;
}
