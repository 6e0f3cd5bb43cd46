/**
 * parseEvent benchmark: 20,000 valid events of every type, in the proportions of a real
 * canal (mostly spreader.placed / accessory.placed), parsed in a loop after a warm-up.
 * Prints the median of several rounds, since the machine is shared.
 *   npx tsx scripts/bench/rules-parse.ts
 */
import { parseEvent } from '../../src/lib/rules/index.ts';

const EVENTS = 20_000;
const ROUNDS = 7;
const NOW = new Date('2026-12-03T09:00:00.000Z');
const BASE_MS = Date.parse('2026-12-02T09:00:00.000Z');

const uuid = (n: number) => `00000000-0000-4000-8000-${n.toString(16).padStart(12, '0')}`;

/** One canal's events (data only), in the order a student records them. */
function canal(): { type: string; data?: Record<string, unknown>; caseLevel?: boolean }[] {
  const out: { type: string; data?: Record<string, unknown>; caseLevel?: boolean }[] = [
    { type: 'case.opened', data: { setting: 'patient', tooth: 46, chartRef: ' DEMO-7 ' }, caseLevel: true },
    {
      type: 'canal.added',
      data: {
        name: 'D',
        referencePoint: 'distobuccal cusp tip',
        cwlMm: 21,
        mafSize: 35,
        preparation: '0.04',
        orificeDepthMm: 4,
        spreader: 'MF',
        accessorySize: 'MF',
        sealer: 'zoe',
      },
    },
    { type: 'canal.cwlCorrected', data: { cwlMm: 21.5, reason: 'apex locator' } },
    { type: 'radiograph.taken', data: { purpose: 'working-length', radiographId: 'r-1' } },
    { type: 'seat.checked', data: { fileSize: '35', lengthMm: 21.5, result: 'seated' } },
    { type: 'taper.checked', data: { spreader: 'MF', depthMm: 20 } },
    { type: 'canal.rinsed', data: { solutions: ['naocl', 'edta', 'naocl'] } },
    { type: 'canal.dried', data: { pointSize: 'medium', measuredMm: 21.5 } },
    { type: 'master.fitted', data: { size: '35', lengthMm: 21.5, reachedLength: true, tugBack: true } },
    { type: 'master.seated', data: { sealer: 'epoxy-resin' } },
  ];
  for (let i = 0; i < 12; i++) {
    out.push({ type: 'spreader.placed', data: { spreader: 'MF', depthMm: 19.5 - i } });
    out.push({ type: 'accessory.placed', data: { size: 'MF', lengthMm: 19.5 - i, reachedLength: i !== 3 } });
  }
  out.push(
    { type: 'accessory.removed', data: { eventId: uuid(1), reason: '' } },
    { type: 'fill.assessed', data: { length: 'flush', voids: false } },
    { type: 'gp.seared', data: { atOrifice: true, relativeToCejMm: -1.5 } },
    { type: 'gp.compacted' },
    { type: 'chamber.cleaned', data: { agent: 'alcohol' } },
    { type: 'access.restored', data: { kind: 'temporary', material: 'Cavit' }, caseLevel: true },
    { type: 'note.added', data: { text: '  cone bent at 15 mm ' } },
    { type: 'event.voided', data: { eventId: uuid(2), reason: 'typo' } },
    { type: 'case.submitted', data: {}, caseLevel: true },
  );
  return out;
}

const steps = canal();
const events = Array.from({ length: EVENTS }, (_, i) => {
  const s = steps[i % steps.length]!;
  return {
    id: uuid(1000 + i),
    caseId: uuid(7).toUpperCase(),
    ...(s.caseLevel ? {} : { canalId: uuid(8) }),
    type: s.type,
    at: new Date(BASE_MS + i * 1000).toISOString(),
    data: s.data,
  };
});

// Every event must be accepted, or the benchmark would time the error path.
for (const e of events) {
  const r = parseEvent(e, NOW);
  if (!r.ok) throw new Error(`${e.type} rejected: ${r.error}`);
}

function round(): number {
  const t0 = performance.now();
  for (const e of events) parseEvent(e, NOW);
  return ((performance.now() - t0) * 1000) / events.length;
}

for (let i = 0; i < 3; i++) round(); // warm-up: let the JIT settle
const times = Array.from({ length: ROUNDS }, round).sort((a, b) => a - b);
const median = times[Math.floor(ROUNDS / 2)]!;
console.log(`rounds (µs/event): ${times.map((t) => t.toFixed(2)).join(' ')}`);
console.log(`rules.parse.us_per_event: ${median.toFixed(2)}`);
