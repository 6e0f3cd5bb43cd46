// A short title for every finding code, for lists and counts where the student's message is
// too long. The catalogue's prose (rules/findings.ts) stays on the server and the reference page.
import type { FindingCode } from '../rules/core';
import { plainWords } from './labels';

export const FINDING_TITLE: Readonly<Record<FindingCode, string>> = {
  'cwl-unusual-for-tooth': 'CWL unusual for the tooth',
  'cwl-corrected-without-reason': 'CWL corrected with no reason',
  'seat-not-confirmed': 'MAF seat not confirmed',
  'seat-file-not-maf': 'Seat checked with another file size',
  'taper-not-checked': 'Taper not checked',
  'taper-short': 'Taper check short of the CWL',
  'taper-beyond-cwl': 'Taper check past the CWL',
  'maf-radiograph-missing': 'MAF radiograph missing',
  'final-rinse-incomplete': 'Final rinse incomplete',
  'paper-point-long': 'Paper point past the CWL',
  'master-size-mismatch': 'Master cone size differs from the MAF',
  'master-length-mismatch': 'Master cone not at length',
  'master-beyond-cwl': 'Master cone past the CWL',
  'cone-fit-radiograph-missing': 'Cone-fit radiograph missing',
  'cone-fit-retake-needed': 'Cone-fit radiograph to retake',
  'cone-fit-not-approved': 'Sealed before the cone fit was approved',
  'compaction-before-seat': 'Compaction before the cone was seated',
  'spreader-beyond-cwl': 'Spreader past the CWL',
  'first-spreader-short': 'First spreader short',
  'accessory-without-spreader': 'Accessory cone without a spreader',
  'accessory-length-mismatch': 'Accessory cone length off the spreader depth',
  'accessory-short': 'Accessory cone stopped short',
  'accessory-beyond-cwl': 'Accessory cone past the CWL',
  'accessory-size-mismatch': 'Accessory cone size differs from the spreader',
  'compaction-incomplete': 'Compaction incomplete',
  'few-accessory-cones': 'Few accessory cones',
  'fill-check-radiograph-missing': 'Fill-check radiograph missing',
  'fill-short': 'Fill short',
  'fill-beyond': 'Fill past the apex',
  'fill-voids': 'Voids in the fill',
  'sear-above-cej': 'Seared above the CEJ',
  'sear-level-missing': 'Sear level not recorded',
  'restoration-missing': 'Access not restored',
  'postop-radiograph-missing': 'Postoperative radiograph missing',
};

/** The short title of a finding code; an unknown code (from a newer server) in plain words. */
export function findingTitle(code: string): string {
  return Object.hasOwn(FINDING_TITLE, code) ? FINDING_TITLE[code as FindingCode] : plainWords(code);
}
