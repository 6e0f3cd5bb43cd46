/** Builds event sequences in the sync contract's shape for API tests (invented values). */
import { randomUUID } from 'node:crypto';
import type { DemoEvent } from '../../db/demo/script';

/** An event as the tablet sends it (the demo seed writes the same shape). */
export type WireEvent = DemoEvent;

export class EventWriter {
  readonly caseId = randomUUID();
  readonly events: WireEvent[] = [];
  private t: number;

  constructor(start = Date.now() - 3_600_000) {
    this.t = start;
  }

  add(type: string, data: Record<string, unknown> = {}, canalId?: string): WireEvent {
    this.t += 1000;
    const e: WireEvent = {
      id: randomUUID(),
      caseId: this.caseId,
      ...(canalId ? { canalId } : {}),
      type,
      at: new Date(this.t).toISOString(),
      data,
    };
    this.events.push(e);
    return e;
  }

  open(setting: 'block' | 'extracted' | 'patient' = 'extracted', tooth = 46): WireEvent {
    return this.add(
      'case.opened',
      setting === 'block'
        ? { setting }
        : setting === 'patient'
          ? { setting, tooth, chartRef: 'TST-0001' }
          : { setting, tooth },
    );
  }

  canal(name = 'D', cwlMm = 21): string {
    const canalId = randomUUID();
    this.add(
      'canal.added',
      {
        name,
        referencePoint: 'distobuccal cusp tip',
        cwlMm,
        mafSize: '35',
        preparation: 'step-back',
        spreader: 'MF',
        accessorySize: 'MF',
      },
      canalId,
    );
    return canalId;
  }

  /** A canal done by the book on an extracted tooth, `cones` accessory cones. */
  textbook(canalId: string, cwlMm = 21, cones = 4): void {
    this.add('seat.checked', { fileSize: '35', lengthMm: cwlMm, result: 'seated' }, canalId);
    this.add('taper.checked', { spreader: 'MF', depthMm: cwlMm - 1 }, canalId);
    this.add('radiograph.taken', { purpose: 'maf' }, canalId);
    this.add('canal.rinsed', { solutions: ['naocl', 'edta'] }, canalId);
    this.add('canal.dried', { pointSize: 'medium', measuredMm: cwlMm }, canalId);
    this.add('master.fitted', { size: '35', lengthMm: cwlMm, reachedLength: true }, canalId);
    this.add('radiograph.taken', { purpose: 'cone-fit' }, canalId);
    this.add('master.seated', { sealer: 'epoxy-resin' }, canalId);
    const depths = [cwlMm - 1.5, cwlMm - 4, cwlMm - 6.5, 10, 8, 6].slice(0, Math.max(cones, 1));
    for (const d of depths) {
      this.add('spreader.placed', { spreader: 'MF', depthMm: d }, canalId);
      this.add('accessory.placed', { size: 'MF', lengthMm: d, reachedLength: true }, canalId);
    }
    this.add('radiograph.taken', { purpose: 'fill-check' }, canalId);
    this.add('fill.assessed', { length: 'flush', voids: false }, canalId);
    this.add('gp.seared', { atOrifice: true, relativeToCejMm: 1 }, canalId);
    this.add('gp.compacted', {}, canalId);
    this.add('chamber.cleaned', { agent: 'alcohol' }, canalId);
  }
}
