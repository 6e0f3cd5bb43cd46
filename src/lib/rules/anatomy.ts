// Per-tooth anatomy the tablet proposes and the rules compare against. Sources and labels
// are from docs/references.md; where a value has no published source here it says "memory".
import { isValidFdi, toothGroup } from './teeth';

/** The label we give the only canal of a single-canal tooth (our own word; any short label is allowed). */
export const SINGLE_CANAL = 'Main';

/**
 * The canals a tooth usually has, and the ones the tablet offers to add.
 * Seen / partly (Vertucci 1984 and later CBCT studies): maxillary anteriors one canal;
 * maxillary first premolar B, L; maxillary first molar MB, DB, P with MB2 in roughly
 * 37–77 %; mandibular first molar MB, ML, D. Everything else: memory.
 * Returns empty lists for a number that is not a valid FDI tooth.
 */
export function usualCanals(n: number): { canals: string[]; optional: string[] } {
  if (!isValidFdi(n)) return { canals: [], optional: [] };
  const g = toothGroup(n);
  const t = n % 10;
  if (g.kind !== 'molar') {
    if (!g.primary && g.arch === 'maxillary' && t === 4) return { canals: ['B', 'L'], optional: [] };
    // Mandibular incisors and premolars, and maxillary second premolars, sometimes have a
    // second canal (memory); the student adds it by name, so none is proposed here.
    return { canals: [SINGLE_CANAL], optional: [] };
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

// Average tooth lengths in mm, keyed "arch:tooth" for permanent teeth. A range is taken at
// its midpoint. Where sources disagree the first value is used and the other is noted.
const AVERAGE_LENGTHS: Readonly<Record<string, number>> = {
  // Grossman's Endodontic Practice 2020, table 13.2 — seen.
  'maxillary:1': 23.5,
  'maxillary:2': 22,
  'maxillary:3': 27,
  'maxillary:4': 22.25, // first premolar 21.5–23 → midpoint
  // Textbooks and PMC4195450 — seen (sources differ).
  'mandibular:1': 20.7, // another source gives 21.5
  'mandibular:2': 21.1, // sources give up to 23
  'mandibular:4': 22.5,
  // Dental anatomy texts — memory: molars about 20–22 mm. Applied to first and second molars
  // only; third molars vary too much for even a soft note (our judgement).
  'maxillary:6': 21,
  'maxillary:7': 21,
  'mandibular:6': 21,
  'mandibular:7': 21,
};

/**
 * Average length of a permanent tooth type in mm (a range's midpoint), for
 * `cwl-unusual-for-tooth`; null where the table has no value (maxillary and mandibular
 * second premolars, mandibular canine, third molars, primary teeth, invalid numbers).
 */
export function averageLengthMm(n: number): number | null {
  if (!isValidFdi(n)) return null;
  const g = toothGroup(n);
  if (g.primary) return null;
  return AVERAGE_LENGTHS[`${g.arch}:${n % 10}`] ?? null;
}
