/** An event as the timeline reads it: a LogEvent, or anything shaped like one. */
export interface FlowEvent {
  id: string;
  type: string;
  at: string;
  canalId?: string;
  data?: object;
}

/** A field of an event's data, typed loosely (parseEvent checked it). */
export function field<T = unknown>(e: FlowEvent | undefined, key: string): T | undefined {
  return (e?.data as Record<string, unknown> | undefined)?.[key] as T | undefined;
}

const mm = (v: unknown) => (typeof v === 'number' ? `${v.toFixed(1)} mm` : '');
const SOLUTION: Record<string, string> = { naocl: 'NaOCl', edta: 'EDTA', saline: 'saline', chlorhexidine: 'CHX' };
const FILL: Record<string, string> = {
  flush: 'flush',
  'short-0-2': '0–2 mm short',
  'short-over-2': 'over 2 mm short',
  beyond: 'beyond the apex',
};
const SEAT: Record<string, string> = { seated: 'seats and holds', advances: 'goes past', short: 'short of length' };

/** One line in our own words for an event, for the canal's timeline. */
export function describeEvent(e: FlowEvent): string {
  const f = (k: string) => field(e, k);
  switch (e.type) {
    case 'case.opened':
      return f('tooth') ? `Case opened: tooth ${String(f('tooth'))}` : 'Case opened: training block';
    case 'canal.added':
      return `Canal ${String(f('name'))} set up: CWL ${mm(f('cwlMm'))}, MAF ${String(f('mafSize'))}`;
    case 'canal.cwlCorrected':
      return `CWL corrected to ${mm(f('cwlMm'))}`;
    case 'seat.checked':
      return `MAF seat check: ${SEAT[String(f('result'))] ?? String(f('result'))}`;
    case 'taper.checked':
      return `Taper check, spreader ${String(f('spreader'))}: ${mm(f('depthMm'))}`;
    case 'radiograph.taken':
      return `Radiograph taken (${String(f('purpose'))})`;
    case 'canal.rinsed':
      return `Final rinse: ${((f('solutions') as string[] | undefined) ?? []).map((s) => SOLUTION[s] ?? s).join(' + ')}`;
    case 'canal.dried':
      return `Paper points (${String(f('pointSize'))}): ${mm(f('measuredMm'))}`;
    case 'master.fitted':
      return `Master cone ${String(f('size'))}: ${mm(f('lengthMm'))}, ${f('reachedLength') ? 'reached' : 'short'}`;
    case 'master.seated':
      return `Master cone seated with sealer (${String(f('sealer'))})`;
    case 'spreader.placed':
      return `Spreader ${String(f('spreader'))}: ${mm(f('depthMm'))}`;
    case 'accessory.placed':
      return `Accessory cone ${String(f('size'))}: ${mm(f('lengthMm'))}, ${f('reachedLength') ? 'reached' : 'stopped short'}`;
    case 'accessory.removed':
      return 'Short cone removed';
    case 'fill.assessed':
      return `Fill check: ${FILL[String(f('length'))] ?? String(f('length'))}, ${f('voids') ? 'voids seen' : 'no voids'}`;
    case 'gp.seared': {
      const cej = f('relativeToCejMm');
      return `Seared ${f('atOrifice') ? 'at the orifice' : 'elsewhere'}${typeof cej === 'number' ? ` (${cej.toFixed(1)} mm to the CEJ)` : ''}`;
    }
    case 'gp.compacted':
      return 'Vertical compaction done';
    case 'chamber.cleaned':
      return `Chamber cleaned (${String(f('agent'))})`;
    case 'access.restored':
      return `Access restored (${String(f('kind'))})`;
    case 'note.added':
      return 'Note';
    case 'event.voided':
      return 'Withdrawn';
    case 'case.submitted':
      return 'Submitted for review';
    default:
      return e.type;
  }
}
