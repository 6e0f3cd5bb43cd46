// Findings from the end of compaction to submission.
import { describe, expect, it } from 'vitest';
import { canal, codes, only } from './builder';

describe('evaluateCanal', () => {
  describe('compaction-incomplete', () => {
    // Fallback stop depth 12 mm (practice: about 10–12 mm from a cusp tip): CWL 21 → orifice 7.5, coronal third ends at 12.
    it('cautions at sear-off when the last spreader still passes the estimated coronal third, and says it was estimated', () => {
      const log = canal({ patch: { sp4: { depthMm: 12.5 }, acc4: { lengthMm: 12.5 } } });
      const [f] = only(log.evaluate(), 'compaction-incomplete');
      expect(f).toMatchObject({ severity: 'caution', eventId: log.id('sear') });
      expect(f?.message).toContain('the thirds are estimated');
      expect(f?.message).toContain('12.0 mm');
    });
    it('passes a last spreader exactly at the end of the coronal third (practice)', () => {
      expect(
        only(canal({ patch: { sp4: { depthMm: 12 }, acc4: { lengthMm: 12 } } }).evaluate(), 'compaction-incomplete'),
      ).toEqual([]);
    });
    it('uses a recorded orifice depth and then says nothing of an estimate', () => {
      // o = 9, L = 12: the coronal third ends at 13.
      const over = canal({ orificeDepthMm: 9, patch: { sp4: { depthMm: 13.5 }, acc4: { lengthMm: 13.5 } } });
      const [f] = only(over.evaluate(), 'compaction-incomplete');
      expect(f?.message).not.toContain('estimated');
      expect(
        only(
          canal({ orificeDepthMm: 9, patch: { sp4: { depthMm: 13 }, acc4: { lengthMm: 13 } } }).evaluate(),
          'compaction-incomplete',
        ),
      ).toEqual([]);
    });
    it('takes a training block’s top as its orifice', () => {
      // Block CWL 21, o = 0: the coronal third ends at 7.
      const log = canal({ setting: 'block', patch: { sp6: { depthMm: 7.5 }, acc6: { lengthMm: 7.5 } } });
      expect(only(log.evaluate(), 'compaction-incomplete')).toHaveLength(1);
      expect(
        only(
          canal({ setting: 'block', patch: { sp6: { depthMm: 7 }, acc6: { lengthMm: 7 } } }).evaluate(),
          'compaction-incomplete',
        ),
      ).toEqual([]);
    });
    it('cautions when no spreader placement was recorded before sear-off', () => {
      const omit = ['sp1', 'acc1', 'sp2', 'acc2', 'sp3', 'acc3', 'sp4', 'acc4'];
      expect(codes(canal({ omit }).evaluate())).toContain('compaction-incomplete');
    });
    it('waits for sear-off', () => {
      expect(
        only(
          canal({ patch: { sp4: { depthMm: 12.5 }, acc4: { lengthMm: 12.5 } }, until: 'fill' }).evaluate(),
          'compaction-incomplete',
        ),
      ).toEqual([]);
    });
  });

  describe('few-accessory-cones', () => {
    // Usually 4–5 accessory cones (practice); the note's floor is 3.
    it('notes fewer than 3 kept cones at sear-off', () => {
      const log = canal();
      log.remove('out1', 'acc3', { after: 'acc4' });
      log.remove('out2', 'acc4', { after: 'acc4' });
      expect(only(log.evaluate(), 'few-accessory-cones')).toEqual([
        expect.objectContaining({ severity: 'note', eventId: log.id('sear') }),
      ]);
    });
    it('passes exactly 3 kept cones', () => {
      const log = canal();
      log.remove('out1', 'acc4', { after: 'acc4' });
      expect(only(log.evaluate(), 'few-accessory-cones')).toEqual([]);
    });
    it('does not apply to a training block', () => {
      const log = canal({ setting: 'block' });
      for (const k of ['acc1', 'acc2', 'acc3', 'acc4', 'acc5']) log.remove(`out-${k}`, k, { after: 'acc6' });
      expect(only(log.evaluate(), 'few-accessory-cones')).toEqual([]);
    });
  });

  describe('fill-check-radiograph-missing', () => {
    it('cautions when a tooth is seared with no fill-check radiograph', () => {
      const log = canal({ omit: ['fill-rad'] });
      expect(only(log.evaluate(), 'fill-check-radiograph-missing')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('sear') }),
      ]);
    });
    it('does not count a fill-check radiograph taken before the last cone', () => {
      const log = canal({ omit: ['fill-rad'] });
      log.add('early', 'radiograph.taken', { purpose: 'fill-check' }, { after: 'acc3' });
      expect(only(log.evaluate(), 'fill-check-radiograph-missing')).toHaveLength(1);
    });
    it('does not apply to a training block', () => {
      expect(codes(canal({ setting: 'block' }).evaluate())).not.toContain('fill-check-radiograph-missing');
    });
  });

  describe('fill-short, fill-beyond and fill-voids', () => {
    // ESE quality guidelines 2006 (seen, secondary); Jurič et al. 2024 (seen): more than 2 mm short, or past the apex.
    it('cautions on a fill more than 2 mm short', () => {
      const log = canal({ patch: { fill: { length: 'short-over-2' } } });
      expect(only(log.evaluate(), 'fill-short')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('fill') }),
      ]);
    });
    it('accepts a fill 0–2 mm short (ESE 2006 — seen, secondary)', () => {
      expect(codes(canal({ patch: { fill: { length: 'short-0-2' } } }).evaluate())).toEqual([]);
    });
    it('stops a fill beyond the apex and a fill with voids', () => {
      expect(only(canal({ patch: { fill: { length: 'beyond' } } }).evaluate(), 'fill-beyond')[0]?.severity).toBe(
        'stop',
      );
      expect(only(canal({ patch: { fill: { voids: true } } }).evaluate(), 'fill-voids')[0]?.severity).toBe('stop');
    });
    it('takes the latest assessment', () => {
      const log = canal({ patch: { fill: { length: 'beyond', voids: true } } });
      log.add('redo', 'fill.assessed', { length: 'flush', voids: false }, { after: 'fill' });
      expect(codes(log.evaluate())).toEqual([]);
    });
    it('applies to a training block too, judged by eye', () => {
      expect(codes(canal({ setting: 'block', patch: { fill: { length: 'short-over-2' } } }).evaluate())).toEqual([
        'fill-short',
      ]);
    });
  });

  describe('sear-above-cej', () => {
    it('cautions on a posterior tooth seared above the CEJ, even at the orifice', () => {
      const log = canal({ patch: { sear: { relativeToCejMm: -0.5 } } });
      const [f] = only(log.evaluate(), 'sear-above-cej');
      expect(f).toMatchObject({ severity: 'caution', eventId: log.id('sear') });
      expect(f?.message).not.toContain('stain');
    });
    it('warns of crown staining in an anterior tooth, FDI x1–x3 (dental anatomy — memory)', () => {
      for (const tooth of [11, 23, 43]) {
        const log = canal({ tooth, cwlMm: 22, patch: { sear: { atOrifice: false, relativeToCejMm: -1 } } });
        expect(only(log.evaluate(), 'sear-above-cej')[0]?.message).toContain('stain');
      }
    });
    it('passes a sear level at the CEJ or below', () => {
      expect(only(canal({ patch: { sear: { relativeToCejMm: 0 } } }).evaluate(), 'sear-above-cej')).toEqual([]);
    });
    it('does not apply to a training block', () => {
      expect(codes(canal({ setting: 'block', patch: { sear: { relativeToCejMm: -2 } } }).evaluate())).toEqual([]);
    });
  });

  describe('restoration-missing', () => {
    it('cautions on a submitted case whose canal access is not restored', () => {
      const log = canal({ omit: ['restore'] });
      expect(only(log.evaluate(), 'restoration-missing')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('submit') }),
      ]);
    });
    it('waits for submission', () => {
      expect(codes(canal({ omit: ['restore', 'submit'] }).evaluate())).toEqual([]);
    });
    it('counts a restoration on the canal, or one recorded after submission', () => {
      const onCanal = canal({ omit: ['restore'] });
      onCanal.add('restore', 'access.restored', { kind: 'permanent' }, { after: 'clean' });
      expect(only(onCanal.evaluate(), 'restoration-missing')).toEqual([]);
      const late = canal({ omit: ['restore'] });
      late.add('restore', 'access.restored', { kind: 'temporary' }, { caseLevel: true });
      expect(only(late.evaluate(), 'restoration-missing')).toEqual([]);
    });
    it('applies to a training block too', () => {
      expect(codes(canal({ setting: 'block', omit: ['restore'] }).evaluate())).toEqual(['restoration-missing']);
    });
  });

  describe('postop-radiograph-missing', () => {
    it('cautions on a submitted tooth case with no post-operative radiograph', () => {
      const log = canal({ omit: ['post-op'] });
      expect(only(log.evaluate(), 'postop-radiograph-missing')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('submit') }),
      ]);
    });
    it('counts a post-operative radiograph on the canal', () => {
      const log = canal({ omit: ['post-op'] });
      log.add('post-op', 'radiograph.taken', { purpose: 'post-op' }, { after: 'restore' });
      expect(only(log.evaluate(), 'postop-radiograph-missing')).toEqual([]);
    });
    it('waits for submission and does not apply to a training block', () => {
      expect(codes(canal({ omit: ['post-op', 'submit'] }).evaluate())).toEqual([]);
      expect(codes(canal({ setting: 'block' }).evaluate())).toEqual([]);
    });
  });
});
