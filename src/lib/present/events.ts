// One line in our own words for each recorded event: the canal's timeline on the tablet and
// on the case page.
import { cejLevel, mm } from './format';
import {
  canalTitle,
  fillLabel,
  plainWords,
  pointSizeLabel,
  purposeLabel,
  restorationLabel,
  sealerLabel,
  seatLabel,
  solutionLabel,
} from './labels';

/** The part of an event a description reads: its type and data (the rules core checked them). */
export interface DescribedEvent {
  type: string;
  data?: object;
}

/** The reason a withdrawal or removal gives, as ": reason", or nothing. */
const why = (data: Record<string, unknown>): string =>
  typeof data.reason === 'string' && data.reason.trim() ? `: ${data.reason.trim()}` : '';

/** One line for an event, e.g. "Spreader MF: 17.0 mm" or "Radiograph taken (MAF)". */
export function describeEvent(e: DescribedEvent): string {
  const data = (e.data ?? {}) as Record<string, unknown>;
  const s = (k: string) => (data[k] === undefined ? '' : String(data[k]));
  switch (e.type) {
    case 'case.opened':
      return data.tooth ? `Case opened: tooth ${s('tooth')}` : 'Case opened: training block';
    case 'canal.added':
      return `${canalTitle(s('name'))} set up: CWL ${mm(data.cwlMm)}, MAF ${s('mafSize')}`;
    case 'canal.cwlCorrected': {
      const reason = s('reason').trim();
      return `CWL corrected to ${mm(data.cwlMm)}${reason === '' ? ', no reason given' : `: ${reason}`}`;
    }
    case 'seat.checked':
      return `MAF seat check: ${seatLabel(s('result'))}`;
    case 'taper.checked':
      return `Taper check, spreader ${s('spreader')}: ${mm(data.depthMm)}`;
    case 'radiograph.taken':
      return `Radiograph taken (${purposeLabel(s('purpose'))})`;
    case 'canal.rinsed':
      return `Final rinse: ${((data.solutions as string[] | undefined) ?? []).map(solutionLabel).join(' + ')}`;
    case 'canal.dried':
      return `Paper points (${pointSizeLabel(s('pointSize'))}): ${mm(data.measuredMm)}`;
    case 'master.fitted':
      return `Master cone ${s('size')}: ${mm(data.lengthMm)}, ${data.reachedLength ? 'reached' : 'short'}`;
    case 'master.seated':
      return `Master cone seated with sealer (${sealerLabel(s('sealer'))})`;
    case 'spreader.placed':
      return `Spreader ${s('spreader')}: ${mm(data.depthMm)}`;
    case 'accessory.placed':
      return `Accessory cone ${s('size')}: ${mm(data.lengthMm)}, ${data.reachedLength ? 'reached' : 'stopped short'}`;
    case 'fill.assessed':
      return `Fill check: ${fillLabel(s('length'))}, ${data.voids ? 'voids seen' : 'no voids'}`;
    case 'gp.seared': {
      const cej = data.relativeToCejMm;
      return `Seared ${data.atOrifice ? 'at the orifice' : 'elsewhere'}${typeof cej === 'number' ? `, ${cejLevel(cej)}` : ''}`;
    }
    case 'chamber.cleaned':
      return `Chamber cleaned (${s('agent')})`;
    case 'gp.compacted':
      return 'Vertical compaction done';
    case 'access.restored':
      return `Access restored (${restorationLabel(s('kind'))})`;
    case 'accessory.removed':
      return `Short cone removed${why(data)}`;
    case 'note.added':
      return 'Note';
    case 'event.voided':
      return `Withdrawn${why(data)}`;
    case 'case.submitted':
      return 'Submitted for review';
    case 'compaction.finished':
      return 'Compaction finished';
    case 'case.discarded': {
      const reason = s('reason').trim();
      return `Case discarded${reason === '' ? '' : `: ${reason}`}`;
    }
    case 'conefit.requested':
      return 'Asked the attending to check the cone fit';
    case 'conefit.approvedAtChair':
      return 'The attending approved the cone fit at the chair';
    default:
      // A type from a newer server: its words, without the label table the tablet never needs.
      return plainWords(e.type);
  }
}

/**
 * What was withdrawn (an `event.voided`) or taken out (an `accessory.removed`) and why, in
 * the order recorded: "Taper check, spreader MF: 19.5 mm — withdrawn: Undone on the tablet".
 * `events` are every event of the case or canal as stored, voided ones included.
 */
export function withdrawals(
  events: readonly (DescribedEvent & { id: string })[],
): { id: string; what: string; why: string; kind: 'withdrawn' | 'removed' }[] {
  const byId = new Map(events.map((e) => [e.id, e]));
  const out: { id: string; what: string; why: string; kind: 'withdrawn' | 'removed' }[] = [];
  for (const e of events) {
    const data = (e.data ?? {}) as { eventId?: unknown; reason?: unknown };
    if (e.type !== 'event.voided' && e.type !== 'accessory.removed') continue;
    const target = typeof data.eventId === 'string' ? byId.get(data.eventId) : undefined;
    out.push({
      id: e.id,
      kind: e.type === 'event.voided' ? 'withdrawn' : 'removed',
      what: target ? describeEvent(target) : 'An answer no longer on this record',
      why: typeof data.reason === 'string' && data.reason.trim() ? data.reason.trim() : 'no reason given',
    });
  }
  return out;
}
