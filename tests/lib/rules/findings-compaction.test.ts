// Findings of lateral compaction: each raised by one sequence and not by its near miss.
import { describe, expect, it } from 'vitest';
import { canal, codes, only } from './builder';

describe('evaluateCanal', () => {
  describe('compaction-before-seat', () => {
    it('cautions on a spreader placement recorded before the master cone is seated', () => {
      const log = canal();
      const early = log.add('early', 'spreader.placed', { spreader: 'MF', depthMm: 19 }, { after: 'fit' });
      expect(only(log.evaluate(), 'compaction-before-seat')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: early.id }),
      ]);
    });
    it('cautions on an accessory cone recorded before the master cone is seated, or with none seated', () => {
      const log = canal({ until: 'fit' });
      const acc = log.add('acc', 'accessory.placed', { size: 'MF', lengthMm: 19, reachedLength: true });
      expect(only(log.evaluate(), 'compaction-before-seat').map((f) => f.eventId)).toEqual([acc.id]);
    });
    it('does not judge a cone that was withdrawn', () => {
      const log = canal({ until: 'fit' });
      log.add('acc', 'accessory.placed', { size: 'MF', lengthMm: 19, reachedLength: true });
      log.remove('out', 'acc');
      expect(only(log.evaluate(), 'compaction-before-seat')).toEqual([]);
    });
  });

  describe('spreader-beyond-cwl', () => {
    it('stops a spreader depth greater than the CWL', () => {
      const log = canal({ patch: { sp1: { depthMm: 21.5 }, acc1: { lengthMm: 21.5 } } });
      expect(only(log.evaluate(), 'spreader-beyond-cwl')).toEqual([
        expect.objectContaining({ severity: 'stop', eventId: log.id('sp1') }),
      ]);
    });
    it('passes a spreader exactly at the CWL', () => {
      expect(
        only(canal({ patch: { sp1: { depthMm: 21 }, acc1: { lengthMm: 21 } } }).evaluate(), 'spreader-beyond-cwl'),
      ).toEqual([]);
    });
    it('judges every placement again when the CWL is shortened', () => {
      const log = canal();
      log.add('fix', 'canal.cwlCorrected', { cwlMm: 19, reason: 'new radiograph' });
      expect(only(log.evaluate(), 'spreader-beyond-cwl').map((f) => f.eventId)).toEqual([log.id('sp1')]);
    });
  });

  describe('first-spreader-short', () => {
    // First placement within 2 mm of the CWL: trade teaching (practice).
    it('cautions when the first placement after seating stops more than 2.0 mm short', () => {
      const log = canal({ patch: { sp1: { depthMm: 18.5 }, acc1: { lengthMm: 18.5 } } });
      expect(only(log.evaluate(), 'first-spreader-short')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('sp1') }),
      ]);
    });
    it('passes a first placement exactly 2.0 mm short (practice)', () => {
      expect(
        only(canal({ patch: { sp1: { depthMm: 19 }, acc1: { lengthMm: 19 } } }).evaluate(), 'first-spreader-short'),
      ).toEqual([]);
    });
    it('judges only the first placement, not later shallower ones', () => {
      expect(only(canal().evaluate(), 'first-spreader-short')).toEqual([]);
    });
  });

  describe('accessory-without-spreader', () => {
    it('cautions on a cone that follows no spreader placement since the previous kept cone', () => {
      const log = canal();
      const extra = log.add(
        'extra',
        'accessory.placed',
        { size: 'MF', lengthMm: 19.5, reachedLength: true },
        { after: 'acc1' },
      );
      expect(only(log.evaluate(), 'accessory-without-spreader')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: extra.id }),
      ]);
    });
    it('lets a replacement for a withdrawn cone use the same spreader placement', () => {
      const log = canal({ patch: { acc1: { reachedLength: false } } });
      log.remove('out', 'acc1', { after: 'acc1' });
      log.add('again', 'accessory.placed', { size: 'MF', lengthMm: 19.5, reachedLength: true }, { after: 'out' });
      expect(codes(log.evaluate())).toEqual([]);
    });
    it('does not let a placement made before seating open the first cycle', () => {
      const log = canal({ omit: ['sp1'] });
      log.add('early', 'spreader.placed', { spreader: 'MF', depthMm: 19.5 }, { after: 'fit' });
      expect(only(log.evaluate(), 'accessory-without-spreader').map((f) => f.eventId)).toEqual([log.id('acc1')]);
    });
  });

  describe('accessory-length-mismatch', () => {
    // Cone measured to the spreader's depth: practice; margin 0.5 mm (one ruler step).
    it('cautions on a cone measured more than 0.5 mm from the spreader depth', () => {
      const log = canal({ patch: { acc1: { lengthMm: 18.5 } } });
      expect(only(log.evaluate(), 'accessory-length-mismatch')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('acc1') }),
      ]);
      expect(only(canal({ patch: { acc1: { lengthMm: 20.5 } } }).evaluate(), 'accessory-length-mismatch')).toHaveLength(
        1,
      );
    });
    it('passes a cone exactly 0.5 mm from the spreader depth either way (practice)', () => {
      expect(only(canal({ patch: { acc1: { lengthMm: 19 } } }).evaluate(), 'accessory-length-mismatch')).toEqual([]);
      expect(only(canal({ patch: { acc1: { lengthMm: 20 } } }).evaluate(), 'accessory-length-mismatch')).toEqual([]);
    });
    it('never raises accessory-short from the measured length alone', () => {
      expect(codes(canal({ patch: { acc1: { lengthMm: 15 } } }).evaluate())).not.toContain('accessory-short');
    });
  });

  describe('accessory-short', () => {
    // A cone short of the spreader's depth leaves a void and is replaced: practice.
    it('stops a cone recorded as not reaching its length', () => {
      const log = canal({ patch: { acc2: { reachedLength: false } } });
      const [f] = only(log.evaluate(), 'accessory-short');
      expect(f).toMatchObject({ severity: 'stop', eventId: log.id('acc2') });
      expect(f?.message).toContain('remove it and place another');
    });
    it('is cleared once the cone is withdrawn', () => {
      const log = canal({ patch: { acc2: { reachedLength: false } } });
      log.remove('out', 'acc2', { after: 'acc2' });
      expect(only(log.evaluate(), 'accessory-short')).toEqual([]);
    });
    it('comes back when the withdrawal is voided', () => {
      const log = canal({ patch: { acc2: { reachedLength: false } } });
      log.remove('out', 'acc2', { after: 'acc2' });
      log.void('undo', 'out');
      expect(only(log.evaluate(), 'accessory-short')).toHaveLength(1);
    });
  });

  describe('accessory-size-mismatch', () => {
    // Accessory cone size matches the spreader: practice.
    it('notes a cone whose size differs from the latest spreader', () => {
      const log = canal({ patch: { acc1: { size: 'FF' } } });
      expect(only(log.evaluate(), 'accessory-size-mismatch')).toEqual([
        expect.objectContaining({ severity: 'note', eventId: log.id('acc1') }),
      ]);
    });
    it('compares with the spreader of the latest placement before the cone', () => {
      const log = canal({ patch: { sp2: { spreader: 'FF' }, acc2: { size: 'FF' } } });
      expect(only(log.evaluate(), 'accessory-size-mismatch')).toEqual([]);
    });
  });
});
