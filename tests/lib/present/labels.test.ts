import { describe, expect, it } from 'vitest';
import {
  EVENT_TYPES,
  FILL_LENGTHS,
  RADIOGRAPH_PURPOSES,
  SEALERS,
  SETTINGS,
  SOLUTIONS,
  type EventType,
} from '../../../src/lib/rules/core';
import { SEVERITY } from '../../../src/lib/rules/severities';
import {
  CANAL_STATUS_LABEL,
  FINDING_TITLE,
  REVIEW_LABEL,
  bySeverity,
  canalStatusLabel,
  canalTitle,
  toothTitle,
  describeEvent,
  eventTypeLabel,
  fillLabel,
  findingTitle,
  plainWords,
  pointSizeLabel,
  preparationLabel,
  purposeLabel,
  restorationLabel,
  reviewLabel,
  roleLabel,
  sealerLabel,
  seatLabel,
  settingLabel,
  severityWord,
  solutionLabel,
} from '../../../src/lib/present';

/** What a stored code looks like: kebab-case, a dotted event type, or camelCase. */
const RAW_CODE = /\b[a-z][a-z0-9]*(?:-[a-z0-9]+)+\b|\b[a-z]+\.[a-z]+[A-Za-z]*\b|\b[a-z]+[A-Z][A-Za-z]*\b/;

const FINDING_CODES = Object.keys(SEVERITY);
const PREPARATIONS = ['step-back', '0.02', '0.04', '0.06', '0.08', '0.10', '0.12'];

/** Sample data for each event type, every enumerated value at least once across the list. */
const SAMPLES: { type: EventType; data: object }[] = [
  { type: 'case.opened', data: { setting: 'patient', tooth: 36 } },
  { type: 'case.opened', data: { setting: 'block' } },
  { type: 'canal.added', data: { name: 'MB', cwlMm: 21, mafSize: '30', preparation: 'step-back', sealer: 'zoe' } },
  { type: 'canal.cwlCorrected', data: { cwlMm: 20.5, reason: '' } },
  ...['seated', 'advances', 'short'].map((result) => ({
    type: 'seat.checked' as const,
    data: { fileSize: '30', lengthMm: 21, result },
  })),
  { type: 'taper.checked', data: { spreader: 'MF', depthMm: 20 } },
  ...RADIOGRAPH_PURPOSES.map((purpose) => ({ type: 'radiograph.taken' as const, data: { purpose } })),
  { type: 'canal.rinsed', data: { solutions: [...SOLUTIONS] } },
  ...['fine', 'medium', 'coarse'].map((pointSize) => ({
    type: 'canal.dried' as const,
    data: { pointSize, measuredMm: 21 },
  })),
  { type: 'master.fitted', data: { size: '30', lengthMm: 21, reachedLength: true } },
  ...SEALERS.map((sealer) => ({ type: 'master.seated' as const, data: { sealer } })),
  { type: 'spreader.placed', data: { spreader: 'MF', depthMm: 17 } },
  { type: 'accessory.placed', data: { size: 'MF', lengthMm: 16.5, reachedLength: false } },
  { type: 'accessory.removed', data: { eventId: 'x', reason: '' } },
  ...FILL_LENGTHS.map((length) => ({ type: 'fill.assessed' as const, data: { length, voids: false } })),
  { type: 'gp.seared', data: { atOrifice: false, relativeToCejMm: -1 } },
  { type: 'gp.compacted', data: {} },
  { type: 'chamber.cleaned', data: { agent: 'alcohol' } },
  ...['temporary', 'permanent'].map((kind) => ({ type: 'access.restored' as const, data: { kind } })),
  { type: 'note.added', data: { text: 'Invented note' } },
  { type: 'event.voided', data: { eventId: 'x', reason: '' } },
  { type: 'case.submitted', data: {} },
  { type: 'compaction.finished', data: {} },
  { type: 'case.discarded', data: { reason: 'Opened for the wrong tooth' } },
  { type: 'conefit.requested', data: {} },
  { type: 'conefit.approvedAtChair', data: { attendingId: '4' } },
];

describe('the present module', () => {
  it('gives every code a plain label with no raw code in it', () => {
    const rendered: [string, string][] = [
      ...EVENT_TYPES.map((c) => [c, eventTypeLabel(c)] as [string, string]),
      ...RADIOGRAPH_PURPOSES.map((c) => [c, purposeLabel(c)] as [string, string]),
      ...SEALERS.map((c) => [c, sealerLabel(c)] as [string, string]),
      ...SOLUTIONS.map((c) => [c, solutionLabel(c)] as [string, string]),
      ...PREPARATIONS.map((c) => [c, preparationLabel(c)] as [string, string]),
      ...SETTINGS.map((c) => [c, settingLabel(c)] as [string, string]),
      ...Object.keys(CANAL_STATUS_LABEL).map((c) => [c, canalStatusLabel(c)] as [string, string]),
      ...Object.keys(REVIEW_LABEL).map((c) => [c, reviewLabel(c)] as [string, string]),
      ...FINDING_CODES.map((c) => [c, findingTitle(c)] as [string, string]),
      ...['stop', 'caution', 'note'].map((c) => [c, severityWord(c)] as [string, string]),
      ...FILL_LENGTHS.map((c) => [c, fillLabel(c)] as [string, string]),
      ...['seated', 'advances', 'short'].map((c) => [c, seatLabel(c)] as [string, string]),
      ...['fine', 'medium', 'coarse'].map((c) => [c, pointSizeLabel(c)] as [string, string]),
      ...['temporary', 'permanent'].map((c) => [c, restorationLabel(c)] as [string, string]),
      ...['student', 'attending', 'director'].map((c) => [c, roleLabel(c)] as [string, string]),
    ];
    for (const [code, text] of rendered) {
      expect(text.length, code).toBeGreaterThan(0);
      expect(text, code).not.toMatch(RAW_CODE);
    }
  });

  it('describes every event type in words, with no raw code in the line', () => {
    for (const t of EVENT_TYPES)
      expect(
        SAMPLES.some((s) => s.type === t),
        t,
      ).toBe(true);
    for (const s of SAMPLES) expect(describeEvent(s), `${s.type} ${JSON.stringify(s.data)}`).not.toMatch(RAW_CODE);
  });

  it('says "Radiograph taken (MAF)" and names the sealer in words', () => {
    expect(describeEvent({ type: 'radiograph.taken', data: { purpose: 'maf' } })).toBe('Radiograph taken (MAF)');
    expect(describeEvent({ type: 'master.seated', data: { sealer: 'epoxy-resin' } })).toBe(
      'Master cone seated with sealer (epoxy resin)',
    );
  });

  it('has a short title for every finding code, and words for one it does not know', () => {
    expect(Object.keys(FINDING_TITLE).sort()).toEqual([...FINDING_CODES].sort());
    expect(findingTitle('spreader-beyond-cwl')).toBe('Spreader past the CWL');
    expect(findingTitle('new-check-from-later')).toBe('New check from later');
    expect(eventTypeLabel('future.thingDone')).toBe('Future thing done');
    expect(plainWords('canal.cwlCorrected')).toBe('Canal cwl corrected');
  });

  it('orders findings stops first, then cautions, then notes', () => {
    const list = [{ severity: 'note' as const }, { severity: 'stop' as const }, { severity: 'caution' as const }];
    expect(bySeverity(list).map((f) => f.severity)).toEqual(['stop', 'caution', 'note']);
  });
});

describe('canalTitle', () => {
  it('names a canal as a heading, and never says canal twice', () => {
    expect(canalTitle('MB')).toBe('MB canal');
    expect(canalTitle('Main')).toBe('Main canal');
    expect(canalTitle('Canal')).toBe('Canal');
    expect(canalTitle('MB2')).toBe('MB2 canal');
  });
});

describe('toothTitle', () => {
  it('names a tooth as a heading, with its Universal number spelt out when shown', () => {
    expect(toothTitle(36)).toBe('Tooth 36');
    expect(toothTitle(36, '19')).toBe('Tooth 36 (Universal 19)');
  });
});
