// Test helper: builds a canal's events step by step, each one checked by parseEvent, with
// ids and timestamps that are easy to read. Invented demo values only.
import {
  canalThirds,
  evaluateCanal,
  parseEvent,
  type CanalResult,
  type EventType,
  type FindingCode,
  type LogEvent,
  type Tolerances,
} from '../../../src/lib/rules';

const BASE_MS = Date.parse('2026-12-02T09:00:00.000Z');
export const NOW = new Date('2026-12-03T09:00:00.000Z');

export function uuidFor(n: number): string {
  return `00000000-0000-4000-8000-${n.toString(16).padStart(12, '0')}`;
}

let counter = 1;
export function nextId(): string {
  counter += 1;
  return uuidFor(counter);
}

/** Parses a raw event or fails the test with the parse error. */
export function mustParse(raw: unknown): LogEvent {
  const r = parseEvent(raw, NOW);
  if (!r.ok) throw new Error(`test event rejected: ${r.error} in ${JSON.stringify(raw)}`);
  return r.event;
}

export interface Step {
  key: string;
  type: EventType;
  data: Record<string, unknown>;
  caseLevel?: boolean;
}

export interface CanalOptions {
  setting?: 'block' | 'extracted' | 'patient';
  tooth?: number;
  cwlMm?: number;
  mafSize?: string;
  orificeDepthMm?: number;
  /** Replace the data of a step (merged). */
  patch?: Record<string, Record<string, unknown>>;
  /** Leave steps out. */
  omit?: string[];
  /** Stop after this step (inclusive). */
  until?: string;
}

/**
 * A textbook canal on a mandibular left first molar (FDI 36, average 21 mm — Grossman /
 * memory): CWL 21, MAF 30, every check at length, four cones from 19.5 to 10.5 mm, flush fill.
 */
export function textbookSteps(cwl = 21, size = '30', tooth = true, coronalEndMm = 12): Step[] {
  const rad = (purpose: string): Record<string, unknown> => ({ purpose });
  const steps: Step[] = [
    { key: 'seat', type: 'seat.checked', data: { fileSize: size, lengthMm: cwl, result: 'seated' } },
    { key: 'taper', type: 'taper.checked', data: { spreader: 'MF', depthMm: cwl - 1 } },
    { key: 'maf-rad', type: 'radiograph.taken', data: rad('maf') },
    { key: 'rinse', type: 'canal.rinsed', data: { solutions: ['naocl', 'edta'] } },
    { key: 'dry', type: 'canal.dried', data: { pointSize: 'medium', measuredMm: cwl } },
    { key: 'fit', type: 'master.fitted', data: { size, lengthMm: cwl, reachedLength: true, tugBack: true } },
    { key: 'cone-fit-rad', type: 'radiograph.taken', data: rad('cone-fit') },
    { key: 'seated', type: 'master.seated', data: { sealer: 'epoxy-resin' } },
  ];
  // From 1.5 mm short of the CWL, 3 mm shallower each cycle, until the spreader no longer
  // passes the coronal third; at least three cones.
  const depths: number[] = [];
  for (let d = cwl - 1.5; d >= 0.5 && (depths.length < 3 || (depths.at(-1) ?? 0) > coronalEndMm); d -= 3)
    depths.push(d);
  depths.forEach((depth, k) => {
    steps.push({ key: `sp${k + 1}`, type: 'spreader.placed', data: { spreader: 'MF', depthMm: depth } });
    steps.push({
      key: `acc${k + 1}`,
      type: 'accessory.placed',
      data: { size: 'MF', lengthMm: depth, reachedLength: true },
    });
  });
  steps.push(
    { key: 'fill-rad', type: 'radiograph.taken', data: rad('fill-check') },
    { key: 'fill', type: 'fill.assessed', data: { length: 'flush', voids: false } },
    { key: 'sear', type: 'gp.seared', data: tooth ? { atOrifice: true, relativeToCejMm: 0.5 } : { atOrifice: true } },
    { key: 'compact', type: 'gp.compacted', data: {} },
    { key: 'clean', type: 'chamber.cleaned', data: { agent: 'alcohol' } },
    {
      key: 'restore',
      type: 'access.restored',
      data: { kind: 'temporary', material: 'glass ionomer' },
      caseLevel: true,
    },
    { key: 'post-op', type: 'radiograph.taken', data: rad('post-op'), caseLevel: true },
    { key: 'submit', type: 'case.submitted', data: {}, caseLevel: true },
  );
  return tooth ? steps : steps.filter((s) => s.type !== 'radiograph.taken');
}

export class CanalLog {
  readonly caseId = nextId();
  readonly canalId = nextId();
  readonly events: LogEvent[] = [];
  private readonly atByKey = new Map<string, number>();
  private readonly idByKey = new Map<string, string>();
  private minute = 0;

  /** Opens the case and adds the canal. */
  constructor(readonly opts: CanalOptions = {}) {
    const setting = opts.setting ?? 'extracted';
    const tooth = setting === 'block' ? undefined : (opts.tooth ?? 36);
    this.add(
      'open',
      'case.opened',
      { setting, tooth, chartRef: setting === 'patient' ? 'DEMO-0001' : undefined },
      { caseLevel: true },
    );
    this.add('canal', 'canal.added', {
      name: 'D',
      referencePoint: setting === 'block' ? 'block top' : 'distobuccal cusp tip',
      cwlMm: opts.cwlMm ?? 21,
      mafSize: opts.mafSize ?? '30',
      preparation: 'step-back',
      orificeDepthMm: opts.orificeDepthMm,
      spreader: 'MF',
      accessorySize: 'MF',
      sealer: 'epoxy-resin',
    });
  }

  /** Adds one event; `after` puts it 20 s after an earlier step instead of at the end. */
  add(
    key: string,
    type: EventType,
    data: Record<string, unknown>,
    o: { caseLevel?: boolean; after?: string; canalId?: string } = {},
  ): LogEvent {
    let ms: number;
    if (o.after !== undefined) {
      const anchor = this.atByKey.get(o.after);
      if (anchor === undefined) throw new Error(`no step ${o.after}`);
      ms = anchor + 20_000 + this.events.length; // distinct even when two steps follow one anchor
    } else {
      this.minute += 1;
      ms = BASE_MS + this.minute * 60_000;
    }
    const id = nextId();
    const e = mustParse({
      id,
      caseId: this.caseId,
      canalId: o.caseLevel === true ? undefined : (o.canalId ?? this.canalId),
      type,
      at: new Date(ms).toISOString(),
      data,
    });
    this.events.push(e);
    this.atByKey.set(key, ms);
    this.idByKey.set(key, id);
    return e;
  }

  id(key: string): string {
    const id = this.idByKey.get(key);
    if (id === undefined) throw new Error(`no step ${key}`);
    return id;
  }

  /** Withdraws an accessory cone. */
  remove(key: string, accessoryKey: string, o: { after?: string } = {}): LogEvent {
    return this.add(key, 'accessory.removed', { eventId: this.id(accessoryKey), reason: 'stopped short' }, o);
  }

  void(key: string, targetKey: string, o: { caseLevel?: boolean } = {}): LogEvent {
    return this.add(key, 'event.voided', { eventId: this.id(targetKey), reason: 'mistaken tap' }, o);
  }

  evaluate(tolerances?: Partial<Tolerances>): CanalResult {
    const r = evaluateCanal(this.canalId, this.events, tolerances);
    if (r === null) throw new Error('canal not evaluated');
    return r;
  }
}

/** A canal built from the textbook steps with the options' patches and omissions. */
export function canal(opts: CanalOptions = {}): CanalLog {
  const log = new CanalLog(opts);
  const isTooth = (opts.setting ?? 'extracted') !== 'block';
  const cwl = opts.cwlMm ?? 21;
  const thirds = canalThirds(
    cwl,
    opts.orificeDepthMm ?? (isTooth ? undefined : 0),
    undefined,
    isTooth ? (opts.tooth ?? 36) : undefined,
  );
  for (const s of textbookSteps(cwl, opts.mafSize ?? '30', isTooth, thirds.coronalEndMm)) {
    if (!(opts.omit ?? []).includes(s.key)) {
      log.add(s.key, s.type, { ...s.data, ...(opts.patch?.[s.key] ?? {}) }, { caseLevel: s.caseLevel });
    }
    if (s.key === opts.until) break;
  }
  return log;
}

export function codes(r: CanalResult): FindingCode[] {
  return r.findings.map((f) => f.code);
}

export function only(r: CanalResult, code: FindingCode) {
  return r.findings.filter((f) => f.code === code);
}
