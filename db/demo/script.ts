/**
 * A small writer of event sequences for the invented demo clinic: each call appends one
 * event a little after the previous one, with stable ids so the demo is the same every time.
 */
import { v5 as uuidv5 } from 'uuid';

const NAMESPACE = '6b1f0f1e-3c0a-4d7e-9a51-2f4c8e0d7a10';

export interface DemoEvent {
  id: string;
  caseId: string;
  canalId?: string;
  type: string;
  at: string;
  data: Record<string, unknown>;
}

export class CaseScript {
  readonly caseId: string;
  readonly events: DemoEvent[] = [];
  private clock: number;
  private n = 0;

  constructor(
    private readonly key: string,
    start: string,
    opened: Record<string, unknown>,
  ) {
    this.caseId = uuidv5(`${key}/case`, NAMESPACE);
    this.clock = Date.parse(start);
    this.add(undefined, 'case.opened', opened);
  }

  canalId(name: string): string {
    return uuidv5(`${this.key}/canal/${name}`, NAMESPACE);
  }

  /** Appends an event `gapSeconds` after the previous one; returns its id. */
  add(canal: string | undefined, type: string, data: Record<string, unknown> = {}, gapSeconds = 40): string {
    this.clock += gapSeconds * 1000;
    const id = uuidv5(`${this.key}/event/${this.n++}`, NAMESPACE);
    this.events.push({
      id,
      caseId: this.caseId,
      ...(canal ? { canalId: this.canalId(canal) } : {}),
      type,
      at: new Date(this.clock).toISOString(),
      data,
    });
    return id;
  }

  /** Everything from seat check to chamber clean-up, with `depths` as the spreader cycles. */
  fullCanal(
    canal: string,
    o: {
      cwl: number;
      maf: string;
      spreader: string;
      cone: string;
      depths: number[];
      tooth: boolean;
      sear?: Record<string, unknown>;
    },
  ): void {
    this.add(canal, 'seat.checked', { fileSize: o.maf, lengthMm: o.cwl, result: 'seated' });
    this.add(canal, 'taper.checked', { spreader: o.spreader, depthMm: o.cwl - 0.5 });
    if (o.tooth) this.add(canal, 'radiograph.taken', { purpose: 'maf' });
    this.add(canal, 'canal.rinsed', { solutions: ['naocl', 'edta'] }, 120);
    this.add(canal, 'canal.dried', { pointSize: 'medium', measuredMm: o.cwl });
    this.add(canal, 'master.fitted', { size: o.maf, lengthMm: o.cwl, reachedLength: true, tugBack: true });
    if (o.tooth) this.add(canal, 'radiograph.taken', { purpose: 'cone-fit' }, 90);
    this.add(canal, 'master.seated', { sealer: 'epoxy-resin' });
    this.cycles(canal, o.spreader, o.cone, o.depths);
    if (o.tooth) this.add(canal, 'radiograph.taken', { purpose: 'fill-check' }, 90);
    this.add(canal, 'fill.assessed', { length: 'flush', voids: false });
    this.add(canal, 'gp.seared', o.sear ?? (o.tooth ? { atOrifice: true, relativeToCejMm: 1 } : { atOrifice: true }));
    this.add(canal, 'gp.compacted');
    this.add(canal, 'chamber.cleaned', { agent: 'alcohol' });
  }

  cycles(canal: string, spreader: string, cone: string, depths: number[]): void {
    for (const d of depths) {
      this.add(canal, 'spreader.placed', { spreader, depthMm: d }, 25);
      this.add(canal, 'accessory.placed', { size: cone, lengthMm: d, reachedLength: true }, 20);
    }
  }
}
