// Per-tooth anatomy the tablet proposes and the rules compare against. Sources and labels
// are from docs/references.md; where a value has no published source here it says "memory".
import { TEAM_KNOWLEDGE, type Sourced } from './labels';
import { isValidFdi, toothGroup } from './teeth';

/** The label we give the only canal of a single-canal tooth (our own word; any short label is allowed). */
export const SINGLE_CANAL = 'Main';

/** Teeth with one canal as a rule but a second one often enough to offer it (FDI, permanent). */
const SECOND_CANAL_TEETH: ReadonlySet<number> = new Set([31, 32, 41, 42, 34, 44, 15, 25]);

/** The two canals a single-canal tooth has when it has two: buccal (labial) and lingual. */
export const SECOND_CANAL_PAIR: readonly string[] = ['B', 'L'];

/**
 * Mandibular incisors, mandibular first premolars and maxillary second premolars often have a
 * second canal: Vertucci 1984, remembered, not checked here (memory). B and L match the
 * maxillary first premolar's pair (buccal, or labial on an incisor; lingual, or palatal).
 */
export const SECOND_CANAL_SOURCE: Sourced = {
  source: 'Vertucci, Oral Surg Oral Med Oral Pathol 1984',
  label: 'memory',
};

/**
 * The canals a tooth usually has, and the ones the tablet offers to add.
 * Seen / partly (Vertucci 1984 and later CBCT studies): maxillary anteriors one canal;
 * maxillary first premolar B, L; maxillary first molar MB, DB, P with MB2 in roughly
 * 37–77 %; mandibular first molar MB, ML, D. Everything else: memory.
 * On a single-canal tooth that may have two (31, 32, 41, 42, 34, 44, 15, 25), `optional`
 * is the pair B, L that takes the single canal's place: see `pickCanal`.
 * Returns empty lists for a number that is not a valid FDI tooth.
 */
export function usualCanals(n: number): { canals: string[]; optional: string[] } {
  if (!isValidFdi(n)) return { canals: [], optional: [] };
  const g = toothGroup(n);
  const t = n % 10;
  if (g.kind !== 'molar') {
    if (!g.primary && g.arch === 'maxillary' && t === 4) return { canals: ['B', 'L'], optional: [] };
    const optional = SECOND_CANAL_TEETH.has(n) ? [...SECOND_CANAL_PAIR] : [];
    return { canals: [SINGLE_CANAL], optional };
  }
  if (g.arch === 'maxillary') {
    // MB2 is offered for permanent first and second molars (seen for the first, memory for the second).
    const mb2 = !g.primary && (t === 6 || t === 7);
    return { canals: ['MB', 'DB', 'P'], optional: mb2 ? ['MB2'] : [] };
  }
  // A distolingual canal in some mandibular first molars (memory).
  return { canals: ['MB', 'ML', 'D'], optional: !g.primary && t === 6 ? ['DL'] : [] };
}

/**
 * The canal picker's toggle: `name` picked or unpicked in `picked`. Picking one of the B, L
 * pair while a single-canal tooth's single canal is picked puts the pair in its place, so
 * two canals are never called "Main" and "L": ["Main"] + "L" → ["B", "L"].
 */
export function pickCanal(
  usual: { canals: readonly string[]; optional: readonly string[] },
  picked: readonly string[],
  name: string,
): string[] {
  if (picked.includes(name)) return picked.filter((x) => x !== name);
  const splits =
    usual.canals.length === 1 &&
    usual.canals[0] === SINGLE_CANAL &&
    SECOND_CANAL_PAIR.includes(name) &&
    usual.optional.includes(name) &&
    picked.includes(SINGLE_CANAL);
  if (!splits) return [...picked, name];
  const rest = picked.filter((x) => x !== SINGLE_CANAL && !SECOND_CANAL_PAIR.includes(x));
  return [...SECOND_CANAL_PAIR, ...rest];
}

/**
 * Reference point chips for the canal set-up: the tooth's incisal edge or cusp tips;
 * ["block top"] for a training block (no tooth). The tablet adds its own "other" chip.
 * Returns [] for a number that is not a valid FDI tooth.
 */
export function referencePointsFor(n: number | undefined): string[] {
  if (n === undefined) return ['block top'];
  if (!isValidFdi(n)) return [];
  const g = toothGroup(n);
  if (g.kind === 'incisor') return ['incisal edge'];
  if (g.kind === 'canine') return ['cusp tip'];
  if (g.kind === 'premolar') {
    return g.arch === 'maxillary' ? ['buccal cusp tip', 'palatal cusp tip'] : ['buccal cusp tip'];
  }
  return g.arch === 'maxillary'
    ? ['mesiobuccal cusp tip', 'distobuccal cusp tip', 'mesiopalatal cusp tip']
    : ['mesiobuccal cusp tip', 'distobuccal cusp tip', 'mesiolingual cusp tip', 'distolingual cusp tip'];
}

const GROSSMAN_13_2 = "Grossman's Endodontic Practice 2020, table 13.2";
// Wheeler's figures are crown + root length.
const WHEELER = "Wheeler's Dental Anatomy, Physiology and Occlusion";

/** An average tooth length in mm with its source and label (docs/references.md, "Teeth"). */
export interface AverageLength extends Sourced {
  mm: number;
}

/**
 * Average lengths of permanent tooth types in mm, keyed "arch:tooth" (the FDI tooth digit).
 * A range is taken at its midpoint; where sources disagree the first value is used and the
 * other is noted. Third molars have none: they vary too much for even a soft note (judgement).
 */
export const AVERAGE_LENGTHS: Readonly<Record<string, AverageLength>> = {
  'maxillary:1': { mm: 23.5, source: GROSSMAN_13_2, label: 'seen' },
  'maxillary:2': { mm: 22, source: GROSSMAN_13_2, label: 'seen' },
  'maxillary:3': { mm: 27, source: GROSSMAN_13_2, label: 'seen' },
  'maxillary:4': { mm: 22.25, source: GROSSMAN_13_2, label: 'seen' }, // 21.5–23 → midpoint
  'maxillary:5': { mm: 22.5, source: WHEELER, label: 'memory' },
  // Molars about 20–22 mm, taken at 21 (memory), first and second molars only.
  'maxillary:6': { mm: 21, source: TEAM_KNOWLEDGE, label: 'memory' },
  'maxillary:7': { mm: 21, source: TEAM_KNOWLEDGE, label: 'memory' },
  // The mandibular incisors' values are remembered textbook figures; PMC4195450, cited for
  // them before, does not give them. Other figures: 21.5 for the central and up to 23 for
  // the lateral (Wheeler's crown + root: 21.5 and 23.5, memory).
  'mandibular:1': { mm: 20.7, source: TEAM_KNOWLEDGE, label: 'memory' },
  'mandibular:2': { mm: 21.1, source: TEAM_KNOWLEDGE, label: 'memory' },
  'mandibular:3': { mm: 27, source: WHEELER, label: 'memory' },
  'mandibular:4': { mm: 22.5, source: 'PMC4195450', label: 'seen' },
  'mandibular:5': { mm: 22.5, source: WHEELER, label: 'memory' },
  'mandibular:6': { mm: 21, source: TEAM_KNOWLEDGE, label: 'memory' },
  'mandibular:7': { mm: 21, source: TEAM_KNOWLEDGE, label: 'memory' },
};

/**
 * Average length of a permanent tooth type in mm (a range's midpoint), for
 * `cwl-unusual-for-tooth` and the anterior thirds estimate; null where the table has no value
 * (third molars, primary teeth, invalid numbers). Example: 33 → 27 (memory), 15 → 22.5 (memory).
 */
export function averageLengthMm(n: number): number | null {
  if (!isValidFdi(n)) return null;
  const g = toothGroup(n);
  if (g.primary) return null;
  return AVERAGE_LENGTHS[`${g.arch}:${n % 10}`]?.mm ?? null;
}
