/**
 * The invented demo clinic: Larkfield School of Dental Medicine, endodontic teaching
 * clinic. Every person, chart number, length and size here is made up for the demo.
 */
import { CaseScript } from './script';

export const DEMO_PASSWORD = 'coneline-demo-2026';
export const COHORT = { name: 'Larkfield class of 2028', graduation_year: 2028 };

export const PEOPLE = [
  { key: 'mira', email: 'mira.okafor@larkfield.example', name: 'Mira Okafor', role: 'student' },
  { key: 'tomas', email: 'tomas.lindqvist@larkfield.example', name: 'Tomas Lindqvist', role: 'student' },
  { key: 'priya', email: 'priya.raman@larkfield.example', name: 'Priya Raman', role: 'student' },
  { key: 'helen', email: 'helen.vasquez@larkfield.example', name: 'Dr Helen Vasquez', role: 'attending' },
  { key: 'samuel', email: 'samuel.osei@larkfield.example', name: 'Dr Samuel Osei', role: 'attending' },
  { key: 'ingrid', email: 'ingrid.holm@larkfield.example', name: 'Dr Ingrid Holm', role: 'director' },
] as const;

export const ASSIGNMENTS: [attending: string, student: string][] = [
  ['helen', 'mira'],
  ['helen', 'tomas'],
  ['samuel', 'tomas'],
  ['samuel', 'priya'],
];

export interface DemoCase {
  student: string;
  script: CaseScript;
  review?: { by: string; decision: 'approved' | 'returned'; comment: string };
}

function canal(
  s: CaseScript,
  name: string,
  ref: string,
  cwl: number,
  maf: string,
  extra: Record<string, unknown> = {},
): void {
  s.add(name, 'canal.added', {
    name,
    referencePoint: ref,
    cwlMm: cwl,
    mafSize: maf,
    preparation: 'step-back',
    spreader: 'MF',
    accessorySize: 'MF',
    sealer: 'epoxy-resin',
    ...extra,
  });
}

export function demoCases(): DemoCase[] {
  // Mira: a training block, done cleanly and submitted.
  const block = new CaseScript('mira-block-1', '2026-11-16T09:00:00Z', { setting: 'block' });
  canal(block, 'Canal', 'block top', 18, '30', { orificeDepthMm: 0 });
  block.fullCanal('Canal', {
    cwl: 18,
    maf: '30',
    spreader: 'MF',
    cone: 'MF',
    depths: [16.5, 14, 11.5, 9, 5.5],
    tooth: false,
  });
  block.add(undefined, 'access.restored', { kind: 'temporary' });
  block.add(undefined, 'case.submitted');

  // Mira: an extracted lower left first molar, under way; the distal canal had a short cone redone.
  const molar = new CaseScript('mira-36', '2026-11-30T13:10:00Z', { setting: 'extracted', tooth: 36 });
  canal(molar, 'MB', 'mesiobuccal cusp tip', 21, '25', { orificeDepthMm: 7 });
  canal(molar, 'ML', 'mesiolingual cusp tip', 20.5, '25', { orificeDepthMm: 7 });
  canal(molar, 'D', 'distobuccal cusp tip', 21.5, '35', { orificeDepthMm: 7.5 });
  molar.fullCanal('D', { cwl: 21.5, maf: '35', spreader: 'MF', cone: 'MF', depths: [20, 18], tooth: true });
  // Not done yet: one more cycle with a cone that stopped short, withdrawn and redone.
  molar.events.splice(
    molar.events.findIndex(
      (e) => e.type === 'radiograph.taken' && e.data.purpose === 'fill-check' && e.canalId === molar.canalId('D'),
    ),
  );
  molar.add('D', 'spreader.placed', { spreader: 'MF', depthMm: 16 });
  const short = molar.add('D', 'accessory.placed', { size: 'MF', lengthMm: 16, reachedLength: false });
  molar.add('D', 'accessory.removed', { eventId: short, reason: 'stopped 1 mm short of the spreader depth' });
  molar.add('D', 'accessory.placed', { size: 'MF', lengthMm: 16, reachedLength: true });
  molar.cycles('D', 'MF', 'MF', [14, 12]);
  molar.add('MB', 'seat.checked', { fileSize: '25', lengthMm: 21, result: 'seated' });
  molar.add('MB', 'taper.checked', { spreader: 'MF', depthMm: 20 });

  // Tomas: a patient's upper left central incisor, submitted; seared above the CEJ.
  const incisor = new CaseScript('tomas-21', '2026-11-24T10:30:00Z', {
    setting: 'patient',
    tooth: 21,
    chartRef: 'LK-40517',
  });
  canal(incisor, 'Canal', 'incisal edge', 22.5, '50', { spreader: 'M', accessorySize: 'M', orificeDepthMm: 9 });
  incisor.fullCanal('Canal', {
    cwl: 22.5,
    maf: '50',
    spreader: 'M',
    cone: 'M',
    depths: [21, 19, 17, 15, 13],
    tooth: true,
    sear: { atOrifice: false, relativeToCejMm: -1 },
  });
  incisor.add(undefined, 'access.restored', { kind: 'permanent', material: 'composite' });
  incisor.add(undefined, 'radiograph.taken', { purpose: 'post-op' });
  incisor.add(undefined, 'case.submitted');

  // Priya: an extracted upper right first premolar, signed off.
  const premolar = new CaseScript('priya-14', '2026-11-18T14:00:00Z', { setting: 'extracted', tooth: 14 });
  canal(premolar, 'B', 'buccal cusp tip', 21, '30', { orificeDepthMm: 8 });
  canal(premolar, 'L', 'lingual cusp tip', 20.5, '30', { orificeDepthMm: 8 });
  premolar.fullCanal('B', {
    cwl: 21,
    maf: '30',
    spreader: 'MF',
    cone: 'MF',
    depths: [19.5, 17.5, 15, 12.5, 10],
    tooth: true,
  });
  premolar.fullCanal('L', {
    cwl: 20.5,
    maf: '30',
    spreader: 'MF',
    cone: 'MF',
    depths: [19, 17, 14.5, 12, 9.5],
    tooth: true,
  });
  premolar.add(undefined, 'access.restored', { kind: 'temporary' });
  premolar.add(undefined, 'radiograph.taken', { purpose: 'post-op' });
  premolar.add(undefined, 'case.submitted');

  // Priya: a training block returned: the taper check stopped well short.
  const block2 = new CaseScript('priya-block-1', '2026-11-12T09:15:00Z', { setting: 'block' });
  canal(block2, 'Canal', 'block top', 17, '25', { orificeDepthMm: 0 });
  block2.add('Canal', 'seat.checked', { fileSize: '25', lengthMm: 17, result: 'seated' });
  block2.add('Canal', 'taper.checked', { spreader: 'MF', depthMm: 14.5 });
  block2.add('Canal', 'canal.rinsed', { solutions: ['naocl', 'edta'] });
  block2.add('Canal', 'canal.dried', { pointSize: 'medium', measuredMm: 17 });
  block2.add('Canal', 'master.fitted', { size: '25', lengthMm: 17, reachedLength: true });
  block2.add('Canal', 'master.seated', { sealer: 'zoe' });
  block2.cycles('Canal', 'MF', 'MF', [15, 12.5, 10, 6]);
  block2.add('Canal', 'fill.assessed', { length: 'flush', voids: true });
  block2.add('Canal', 'gp.seared', { atOrifice: true });
  block2.add(undefined, 'access.restored', { kind: 'temporary' });
  block2.add(undefined, 'case.submitted');

  return [
    { student: 'mira', script: block },
    { student: 'mira', script: molar },
    { student: 'tomas', script: incisor },
    {
      student: 'priya',
      script: premolar,
      review: { by: 'samuel', decision: 'approved', comment: 'Even fill to length in both canals. Well done.' },
    },
    {
      student: 'priya',
      script: block2,
      review: {
        by: 'samuel',
        decision: 'returned',
        comment: 'The taper check stopped 2.5 mm short: widen the canal, then redo the fill.',
      },
    },
  ];
}
