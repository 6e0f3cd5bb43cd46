// Findings up to the seated master cone: for each, a sequence that raises it and a near
// miss (boundary values exactly at the tolerance) that must not.
import { describe, expect, it } from 'vitest';
import { canal, codes, only } from './builder';

describe('evaluateCanal', () => {
  it('raises nothing on a textbook canal', () => {
    expect(canal().evaluate().findings).toEqual([]);
  });

  describe('cwl-unusual-for-tooth', () => {
    // Molars about 20–22 mm (team's knowledge — memory): FDI 36 averages 21 mm; margin 4 mm (judgement).
    it('notes a CWL more than 4 mm longer than the tooth type average', () => {
      const log = canal({ cwlMm: 25.5 });
      const [f] = only(log.evaluate(), 'cwl-unusual-for-tooth');
      expect(f).toMatchObject({ severity: 'note', eventId: log.id('canal') });
      expect(f?.message).toContain('4.5 mm longer than an average mandibular left first molar');
    });
    it('stays silent exactly at the margin, longer or shorter (molars, memory)', () => {
      expect(only(canal({ cwlMm: 25 }).evaluate(), 'cwl-unusual-for-tooth')).toEqual([]);
      expect(only(canal({ cwlMm: 17 }).evaluate(), 'cwl-unusual-for-tooth')).toEqual([]);
      expect(only(canal({ cwlMm: 16.5 }).evaluate(), 'cwl-unusual-for-tooth')).toHaveLength(1);
    });
    it('uses the maxillary central incisor average of 23.5 mm (Grossman 2020, table 13.2 — seen)', () => {
      expect(only(canal({ tooth: 11, cwlMm: 27.5 }).evaluate(), 'cwl-unusual-for-tooth')).toEqual([]);
      expect(only(canal({ tooth: 11, cwlMm: 28 }).evaluate(), 'cwl-unusual-for-tooth')).toHaveLength(1);
    });
    it('judges the corrected CWL and points at the correction', () => {
      const log = canal();
      const fix = log.add('fix', 'canal.cwlCorrected', { cwlMm: 25.5, reason: 'new radiograph' });
      expect(only(log.evaluate(), 'cwl-unusual-for-tooth')[0]?.eventId).toBe(fix.id);
    });
    it('does not apply to a training block, nor to a tooth with no average in the table (third molars: judgement)', () => {
      expect(only(canal({ setting: 'block', cwlMm: 30 }).evaluate(), 'cwl-unusual-for-tooth')).toEqual([]);
      expect(only(canal({ tooth: 48, cwlMm: 30 }).evaluate(), 'cwl-unusual-for-tooth')).toEqual([]);
    });
    it('notes an implausible CWL on a mandibular canine (27 mm) or a second premolar (22.5 mm) (Wheeler’s crown + root — memory)', () => {
      for (const tooth of [33, 43]) {
        expect(only(canal({ tooth, cwlMm: 22.5 }).evaluate(), 'cwl-unusual-for-tooth'), String(tooth)).toHaveLength(1);
        expect(only(canal({ tooth, cwlMm: 23 }).evaluate(), 'cwl-unusual-for-tooth'), String(tooth)).toEqual([]);
      }
      for (const tooth of [15, 25, 35, 45]) {
        expect(only(canal({ tooth, cwlMm: 27 }).evaluate(), 'cwl-unusual-for-tooth'), String(tooth)).toHaveLength(1);
        expect(only(canal({ tooth, cwlMm: 26.5 }).evaluate(), 'cwl-unusual-for-tooth'), String(tooth)).toEqual([]);
        expect(only(canal({ tooth, cwlMm: 18 }).evaluate(), 'cwl-unusual-for-tooth'), String(tooth)).toHaveLength(1);
      }
    });
    it('follows a course director’s wider margin', () => {
      expect(only(canal({ cwlMm: 25.5 }).evaluate({ cwlUnusualMarginMm: 5 }), 'cwl-unusual-for-tooth')).toEqual([]);
    });
  });

  describe('seat-not-confirmed', () => {
    it('stops a master cone seated with no seat check before it', () => {
      const log = canal({ omit: ['seat'] });
      expect(only(log.evaluate(), 'seat-not-confirmed')).toEqual([
        expect.objectContaining({ severity: 'stop', eventId: log.id('seated') }),
      ]);
    });
    it('stops a seat check that was not at the CWL', () => {
      const log = canal({ patch: { seat: { lengthMm: 20.5 } } });
      const [f] = only(log.evaluate(), 'seat-not-confirmed');
      expect(f).toMatchObject({ eventId: log.id('seat') });
      expect(f?.message).toContain('20.5 mm, not at the CWL of 21.0 mm');
    });
    it('stops an MAF that advanced or stopped short', () => {
      expect(codes(canal({ patch: { seat: { result: 'advances' } } }).evaluate())).toContain('seat-not-confirmed');
      expect(codes(canal({ patch: { seat: { result: 'short' } } }).evaluate())).toContain('seat-not-confirmed');
    });
    it('takes the latest seat check before seating: a good recheck clears a failed one', () => {
      const log = canal({ patch: { seat: { result: 'short' } } });
      log.add('recheck', 'seat.checked', { fileSize: '30', lengthMm: 21, result: 'seated' }, { after: 'seat' });
      expect(only(log.evaluate(), 'seat-not-confirmed')).toEqual([]);
    });
    it('ignores a seat check recorded after seating', () => {
      const log = canal({ omit: ['seat'] });
      log.add('late', 'seat.checked', { fileSize: '30', lengthMm: 21, result: 'seated' });
      expect(only(log.evaluate(), 'seat-not-confirmed')).toHaveLength(1);
    });
    it('judges the seat check again when the CWL is corrected', () => {
      const log = canal();
      log.add('fix', 'canal.cwlCorrected', { cwlMm: 21.5, reason: 'apex locator' });
      expect(only(log.evaluate(), 'seat-not-confirmed')).toHaveLength(1);
    });
    it('waits for the master cone to be seated', () => {
      expect(only(canal({ omit: ['seat'], until: 'fit' }).evaluate(), 'seat-not-confirmed')).toEqual([]);
    });
  });

  describe('taper-not-checked', () => {
    it('cautions when the master cone is seated with no taper check', () => {
      const log = canal({ omit: ['taper'] });
      expect(only(log.evaluate(), 'taper-not-checked')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('seated') }),
      ]);
    });
    it('does not count a taper check recorded after seating', () => {
      const log = canal({ omit: ['taper'] });
      log.add('late', 'taper.checked', { spreader: 'MF', depthMm: 20 }, { after: 'seated' });
      expect(only(log.evaluate(), 'taper-not-checked')).toHaveLength(1);
    });
    it('says nothing before seating', () => {
      expect(only(canal({ omit: ['taper'], until: 'fit' }).evaluate(), 'taper-not-checked')).toEqual([]);
    });
  });

  describe('taper-short', () => {
    // Taper check within 1 mm of the CWL: trade teaching (practice), agrees with Allison 1979 (seen).
    it('stops a taper check more than 1.0 mm short of the CWL', () => {
      const log = canal({ patch: { taper: { depthMm: 19.5 } } });
      expect(only(log.evaluate(), 'taper-short')).toEqual([
        expect.objectContaining({ severity: 'stop', eventId: log.id('taper') }),
      ]);
    });
    it('passes a taper check exactly 1.0 mm short (practice)', () => {
      expect(only(canal({ patch: { taper: { depthMm: 20 } } }).evaluate(), 'taper-short')).toEqual([]);
    });
    it('answers at once, before the master cone is seated', () => {
      expect(
        only(canal({ patch: { taper: { depthMm: 19.5 } }, until: 'taper' }).evaluate(), 'taper-short'),
      ).toHaveLength(1);
    });
    it('takes the latest taper check before seating', () => {
      const better = canal({ patch: { taper: { depthMm: 19 } } });
      better.add('recheck', 'taper.checked', { spreader: 'MF', depthMm: 20.5 }, { after: 'taper' });
      expect(only(better.evaluate(), 'taper-short')).toEqual([]);
      const worse = canal();
      worse.add('recheck', 'taper.checked', { spreader: 'MF', depthMm: 19 }, { after: 'taper' });
      expect(only(worse.evaluate(), 'taper-short')).toHaveLength(1);
    });
    it('judges the taper check again when the CWL is corrected', () => {
      const log = canal();
      log.add('fix', 'canal.cwlCorrected', { cwlMm: 21.5, reason: 'apex locator' });
      expect(only(log.evaluate(), 'taper-short')).toHaveLength(1);
    });
    it('never counts the taper check as a spreader placement', () => {
      const log = canal({ patch: { taper: { depthMm: 21.5 } } });
      expect(codes(log.evaluate())).not.toContain('spreader-beyond-cwl');
      expect(codes(log.evaluate())).not.toContain('compaction-before-seat');
    });
  });

  describe('maf-radiograph-missing', () => {
    it('cautions when a tooth’s master cone is seated with no MAF radiograph', () => {
      const log = canal({ omit: ['maf-rad'] });
      expect(only(log.evaluate(), 'maf-radiograph-missing')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('seated') }),
      ]);
    });
    it('does not apply to a training block, and waits for seating', () => {
      expect(codes(canal({ setting: 'block' }).evaluate())).not.toContain('maf-radiograph-missing');
      expect(only(canal({ omit: ['maf-rad'], until: 'fit' }).evaluate(), 'maf-radiograph-missing')).toEqual([]);
    });
  });

  describe('final-rinse-incomplete', () => {
    // Sodium hypochlorite then EDTA: Grande et al., J Endod; Silveira et al. 2013 — seen.
    it('cautions when the rinses before seating lack EDTA', () => {
      const log = canal({ patch: { rinse: { solutions: ['naocl', 'saline'] } } });
      const [f] = only(log.evaluate(), 'final-rinse-incomplete');
      expect(f).toMatchObject({ severity: 'caution', eventId: log.id('seated') });
      expect(f?.message).toContain('did not include EDTA');
    });
    it('names both solutions when no rinse was recorded', () => {
      expect(only(canal({ omit: ['rinse'] }).evaluate(), 'final-rinse-incomplete')[0]?.message).toContain(
        'sodium hypochlorite or EDTA',
      );
    });
    it('adds rinses together over several steps', () => {
      const log = canal({ patch: { rinse: { solutions: ['naocl'] } } });
      log.add('rinse2', 'canal.rinsed', { solutions: ['edta'] }, { after: 'rinse' });
      expect(only(log.evaluate(), 'final-rinse-incomplete')).toEqual([]);
    });
    it('does not count a rinse recorded after seating', () => {
      const log = canal({ patch: { rinse: { solutions: ['naocl'] } } });
      log.add('rinse2', 'canal.rinsed', { solutions: ['edta'] }, { after: 'seated' });
      expect(only(log.evaluate(), 'final-rinse-incomplete')).toHaveLength(1);
    });
  });

  describe('paper-point-long', () => {
    it('stops a paper point measured longer than the CWL', () => {
      const log = canal({ patch: { dry: { measuredMm: 21.5 } } });
      expect(only(log.evaluate(), 'paper-point-long')).toEqual([
        expect.objectContaining({ severity: 'stop', eventId: log.id('dry') }),
      ]);
    });
    it('passes a paper point exactly at the CWL', () => {
      expect(only(canal({ patch: { dry: { measuredMm: 21 } } }).evaluate(), 'paper-point-long')).toEqual([]);
    });
    it('judges the paper point again when the CWL is shortened', () => {
      const log = canal();
      log.add('fix', 'canal.cwlCorrected', { cwlMm: 20.5, reason: 'new radiograph' });
      expect(only(log.evaluate(), 'paper-point-long')).toHaveLength(1);
    });
  });

  describe('master-size-mismatch', () => {
    // Master cone of the MAF's ISO size: trade teaching (practice).
    it('cautions when the master cone size differs from the MAF', () => {
      const log = canal({ patch: { fit: { size: '35' } } });
      expect(only(log.evaluate(), 'master-size-mismatch')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('fit') }),
      ]);
    });
    it('judges only the latest fit', () => {
      const log = canal({ patch: { fit: { size: '35' } } });
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 21, reachedLength: true }, { after: 'fit' });
      expect(only(log.evaluate(), 'master-size-mismatch')).toEqual([]);
    });
  });

  describe('master-length-mismatch', () => {
    // Master cone to the full CWL: practice; margin 0.5 mm (some teaching fits it 0.5 mm short — practice).
    it('stops a master cone that did not reach', () => {
      const log = canal({ patch: { fit: { reachedLength: false } } });
      expect(only(log.evaluate(), 'master-length-mismatch')).toEqual([
        expect.objectContaining({ severity: 'stop', eventId: log.id('fit') }),
      ]);
    });
    it('stops a fit more than 0.5 mm short of the CWL', () => {
      expect(only(canal({ patch: { fit: { lengthMm: 20 } } }).evaluate(), 'master-length-mismatch')).toHaveLength(1);
    });
    it('passes a fit exactly 0.5 mm short of the CWL (practice)', () => {
      expect(only(canal({ patch: { fit: { lengthMm: 20.5 } } }).evaluate(), 'master-length-mismatch')).toEqual([]);
    });
    it('leaves a fit past the CWL to master-beyond-cwl, whatever the margin', () => {
      const log = canal({ patch: { fit: { lengthMm: 22 } } });
      expect(only(log.evaluate(), 'master-length-mismatch')).toEqual([]);
      expect(only(log.evaluate(), 'master-beyond-cwl')).toHaveLength(1);
    });
  });

  describe('cone-fit-radiograph-missing', () => {
    it('cautions when a tooth’s master cone is seated with no cone-fit radiograph', () => {
      const log = canal({ omit: ['cone-fit-rad'] });
      expect(only(log.evaluate(), 'cone-fit-radiograph-missing')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: log.id('seated') }),
      ]);
    });
    it('does not count a cone-fit radiograph taken before any fit', () => {
      const log = canal({ omit: ['cone-fit-rad'] });
      log.add('early', 'radiograph.taken', { purpose: 'cone-fit' }, { after: 'dry' });
      expect(only(log.evaluate(), 'cone-fit-radiograph-missing')).toHaveLength(1);
    });
    it('is satisfied by one radiograph after the first fit, even when the cone is refitted later', () => {
      const log = canal();
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 21, reachedLength: true }, { after: 'cone-fit-rad' });
      expect(codes(log.evaluate())).toEqual([]);
    });
    it('does not apply to a training block', () => {
      expect(codes(canal({ setting: 'block', omit: ['cone-fit-rad'] }).evaluate())).not.toContain(
        'cone-fit-radiograph-missing',
      );
    });
  });

  describe('cone-fit-retake-needed', () => {
    // Retake when the cone is changed by 1 mm or more: trade teaching (practice).
    it('cautions when the cone is refitted 1.0 mm from the length the radiograph showed', () => {
      const log = canal();
      const refit = log.add(
        'refit',
        'master.fitted',
        { size: '30', lengthMm: 20, reachedLength: true },
        { after: 'cone-fit-rad' },
      );
      expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([
        expect.objectContaining({ severity: 'caution', eventId: refit.id }),
      ]);
    });
    it('needs no retake for a 0.5 mm change (practice)', () => {
      const log = canal();
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 20.5, reachedLength: true }, { after: 'cone-fit-rad' });
      expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([]);
    });
    it('is cleared by a newer cone-fit radiograph', () => {
      const log = canal();
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 20, reachedLength: true }, { after: 'cone-fit-rad' });
      log.add('retake', 'radiograph.taken', { purpose: 'cone-fit' }, { after: 'refit' });
      expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([]);
    });
    it('compares the cone now in place: a refit back to the radiographed length needs no retake', () => {
      const log = canal();
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 20, reachedLength: true }, { after: 'cone-fit-rad' });
      log.add('refit2', 'master.fitted', { size: '30', lengthMm: 21, reachedLength: true }, { after: 'refit' });
      expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([]);
    });
    it('does not apply to a training block', () => {
      const log = canal({ setting: 'block' });
      log.add('refit', 'master.fitted', { size: '30', lengthMm: 19, reachedLength: true }, { after: 'fit' });
      expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([]);
    });
  });
});
