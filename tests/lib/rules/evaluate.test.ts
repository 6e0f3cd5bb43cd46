// How evaluateCanal reads a case's events: scope, voids, order, tolerances and state.
import { describe, expect, it } from 'vitest';
import { canalThirds, evaluateCanal, type LogEvent } from '../../../src/lib/rules';
import { canal, CanalLog, codes, mustParse, nextId } from './builder';

describe('evaluateCanal', () => {
  describe('reading the events', () => {
    it('returns null without the case’s case.opened or the canal’s canal.added', () => {
      const log = canal({ until: 'seat' });
      expect(evaluateCanal(log.canalId, log.events.slice(1))).toBeNull();
      expect(
        evaluateCanal(
          log.canalId,
          log.events.filter((e) => e.type !== 'canal.added'),
        ),
      ).toBeNull();
      expect(evaluateCanal(nextId(), log.events)).toBeNull();
    });
    it('returns null once the canal.added is voided', () => {
      const log = canal({ until: 'seat' });
      log.void('undo', 'canal');
      expect(evaluateCanal(log.canalId, log.events)).toBeNull();
    });
    it('ignores another canal’s events and another case’s', () => {
      const log = canal({ until: 'seat' });
      const other = nextId();
      log.add(
        'other',
        'canal.added',
        { name: 'MB', referencePoint: 'MB cusp', cwlMm: 20, mafSize: '25', preparation: 'step-back' },
        { canalId: other },
      );
      log.add('other-dry', 'canal.dried', { pointSize: 'fine', measuredMm: 25 }, { canalId: other });
      const foreign = mustParse({
        ...log.events[2],
        id: nextId(),
        caseId: nextId(),
        type: 'canal.dried',
        data: { pointSize: 'fine', measuredMm: 30 },
      });
      const r = evaluateCanal(log.canalId, [...log.events, foreign]);
      expect(r?.findings).toEqual([]);
      expect(r?.caseId).toBe(log.caseId);
      expect(evaluateCanal(other, log.events)?.findings.map((f) => f.code)).toEqual(['paper-point-long']);
    });
    it('drops voided events, but a voided void voids nothing', () => {
      const log = canal({ patch: { dry: { measuredMm: 22 } } });
      log.void('undo', 'dry');
      expect(codes(log.evaluate())).toEqual([]);
      log.void('redo', 'undo');
      expect(codes(log.evaluate())).toEqual(['paper-point-long']);
    });
    it('lets a void count only within its own scope', () => {
      const log = canal({ omit: ['restore'] });
      log.add('restore', 'access.restored', { kind: 'temporary' }, { caseLevel: true });
      log.void('canal-undo', 'restore'); // names the canal: cannot void a case-level event
      expect(codes(log.evaluate())).toEqual([]);
      log.void('case-undo', 'restore', { caseLevel: true });
      expect(codes(log.evaluate())).toEqual(['restoration-missing']);
    });
    it('orders by `at` as an instant, whatever the offset, then by id', () => {
      const log = canal({ until: 'seat' });
      const base = log.events[1] as LogEvent;
      // 10:30 at +01:00 is 09:30Z, before 09:45Z although its text sorts after.
      const late = mustParse({
        ...base,
        id: nextId(),
        type: 'canal.cwlCorrected',
        at: '2026-12-02T09:45:00.000Z',
        data: { cwlMm: 22, reason: 'second look' },
      });
      const early = mustParse({
        ...base,
        id: nextId(),
        type: 'canal.cwlCorrected',
        at: '2026-12-02T10:30:00.000+01:00',
        data: { cwlMm: 20, reason: 'first look' },
      });
      expect(evaluateCanal(log.canalId, [...log.events, late, early])?.state.cwlMm).toBe(22);
      const tieA = mustParse({
        ...base,
        id: '00000000-0000-4000-8000-0000000000aa',
        type: 'canal.cwlCorrected',
        at: '2026-12-02T11:00:00.000Z',
        data: { cwlMm: 23, reason: 'a' },
      });
      const tieB = mustParse({
        ...base,
        id: '00000000-0000-4000-8000-0000000000bb',
        type: 'canal.cwlCorrected',
        at: '2026-12-02T12:00:00.000+01:00',
        data: { cwlMm: 24, reason: 'b' },
      });
      expect(evaluateCanal(log.canalId, [...log.events, tieB, tieA])?.state.cwlMm).toBe(24);
    });
    it('lists stops first, then cautions, then notes', () => {
      const log = canal({ cwlMm: 25.5, omit: ['taper'], patch: { acc1: { size: 'FF', reachedLength: false } } });
      const severities = log.evaluate().findings.map((f) => f.severity);
      expect(severities).toEqual(
        [...severities].sort((a, b) => ['stop', 'caution', 'note'].indexOf(a) - ['stop', 'caution', 'note'].indexOf(b)),
      );
      expect(new Set(severities)).toEqual(new Set(['stop', 'caution', 'note']));
    });
    it('falls back to the default for a tolerance that is not a usable number', () => {
      const log = canal({ patch: { taper: { depthMm: 19.5 } } });
      expect(codes(log.evaluate({ taperShortMarginMm: Number.NaN }))).toEqual(['taper-short']);
      expect(codes(log.evaluate({ taperShortMarginMm: 1.5 }))).toEqual([]);
    });
    it('never throws on input that did not pass parseEvent', () => {
      const log = canal({ until: 'seat' });
      const broken = [
        null,
        5,
        { type: 'gp.seared' },
        { ...log.events[1], data: null },
        { ...log.events[2], at: 'yesterday' },
      ];
      expect(() => evaluateCanal(log.canalId, [...log.events, ...broken] as LogEvent[])).not.toThrow();
      expect(evaluateCanal(log.canalId, 'nonsense' as unknown as LogEvent[])).toBeNull();
    });
  });

  describe('derived state', () => {
    it('moves through the statuses as the steps are recorded', () => {
      const status = (until: string) => canal({ until }).evaluate().state.status;
      expect(new CanalLog().evaluate().state.status).toBe('set-up');
      expect(status('seat')).toBe('verified');
      expect(status('fit')).toBe('cone-fitted');
      expect(status('seated')).toBe('compacting');
      expect(status('fill')).toBe('filled');
      expect(status('sear')).toBe('seared');
      expect(status('restore')).toBe('restored');
      expect(status('submit')).toBe('submitted');
    });
    it('reads the canal’s set-up and the current CWL', () => {
      const log = canal({ tooth: 16, cwlMm: 20.5, orificeDepthMm: 8 });
      log.add('fix', 'canal.cwlCorrected', { cwlMm: 21, reason: 'apex locator' });
      const s = log.evaluate().state;
      expect(s).toMatchObject({
        name: 'D',
        cwlMm: 21,
        mafSize: '30',
        preparation: 'step-back',
        spreader: 'MF',
        accessorySize: 'MF',
        sealer: 'epoxy-resin',
        orificeDepthMm: 8,
        setting: 'extracted',
        tooth: 16,
      });
      expect(s.thirds).toEqual(canalThirds(21, 8));
    });
    it('keeps accessory cones, withdrawals and spreader depths in order', () => {
      const log = canal({ patch: { acc2: { reachedLength: false } } });
      log.remove('out', 'acc2', { after: 'acc2' });
      log.add('again', 'accessory.placed', { size: 'MF', lengthMm: 16.5, reachedLength: true }, { after: 'out' });
      const s = log.evaluate().state;
      expect(s.accessoryCones).toBe(4);
      expect(s.conesWithdrawn).toBe(1);
      expect(s.accessories.map((a) => [a.lengthMm, a.removed, a.spreaderDepthMm])).toEqual([
        [19.5, false, 19.5],
        [16.5, true, 16.5],
        [16.5, false, 16.5],
        [13.5, false, 13.5],
        [10.5, false, 10.5],
      ]);
      expect(s.spreaderDepths).toEqual([19.5, 16.5, 13.5, 10.5]);
      expect(s.taperCheckDepthMm).toBe(20);
      expect(s.masterCone).toMatchObject({
        size: '30',
        lengthMm: 21,
        reachedLength: true,
        tugBack: true,
        seated: true,
      });
    });
    it('says when compaction is complete and whether the thirds were estimated', () => {
      const open = canal({ until: 'acc3' }).evaluate().state;
      expect(open.complete).toBe(false);
      expect(open.thirds.estimated).toBe(true);
      expect(canal({ until: 'acc4' }).evaluate().state.complete).toBe(true);
      expect(canal({ setting: 'block', until: 'seat' }).evaluate().state.thirds).toMatchObject({
        orificeMm: 0,
        estimated: false,
      });
    });
    it('files radiographs by purpose, case-level post-op ones included', () => {
      const log = canal();
      const r = log.evaluate().state.radiographs;
      expect(r).toEqual({
        'working-length': [],
        maf: [log.id('maf-rad')],
        'cone-fit': [log.id('cone-fit-rad')],
        'fill-check': [log.id('fill-rad')],
        'post-op': [log.id('post-op')],
      });
    });
    it('records the sear level, the time taken and the events counted', () => {
      const log = canal();
      log.add('oops', 'note.added', { text: 'typo' });
      log.void('undo', 'oops');
      const s = log.evaluate().state;
      expect(s.searLevel).toEqual({ atOrifice: true, relativeToCejMm: 0.5 });
      expect(s.firstEventAt).toBe('2026-12-02T09:01:00.000Z');
      expect(s.lastEventAt).toBe('2026-12-02T09:26:00.000Z');
      expect(s.durationMs).toBe(25 * 60_000);
      expect(s.eventCount).toBe(26);
    });
  });
});
