// Verdicts the student can still act on: lengths past the CWL, the seat check, the end of
// compaction, unfilled canals and the checks a clinical teacher expects. Lengths are our own
// demo values on a mandibular first molar (FDI 36, CWL 21 mm); each rule's source is in
// docs/rules.md (most are common practice, no source).
import { describe, expect, it } from 'vitest';
import { canal, CanalLog, codes, only } from './builder';

describe('master-beyond-cwl (common practice, no source: the master cone never passes the CWL)', () => {
  it('stops a master cone fitted 0.5 mm past the CWL at the tap, before it is seated', () => {
    const log = canal({ until: 'fit', patch: { fit: { lengthMm: 21.5 } } });
    expect(only(log.evaluate(), 'master-beyond-cwl')).toEqual([
      expect.objectContaining({ severity: 'stop', eventId: log.id('fit') }),
    ]);
    expect(only(log.evaluate(), 'master-length-mismatch')).toEqual([]);
  });

  it('clears when the cone is refitted at the CWL', () => {
    const log = canal({ until: 'fit', patch: { fit: { lengthMm: 22 } } });
    log.add('refit', 'master.fitted', { size: '30', lengthMm: 21, reachedLength: true });
    expect(codes(log.evaluate())).not.toContain('master-beyond-cwl');
  });

  it('leaves a cone at the CWL alone', () => {
    expect(codes(canal().evaluate())).not.toContain('master-beyond-cwl');
  });
});

describe('taper-beyond-cwl (common practice: the apical stop may be lost)', () => {
  it('cautions at the tap when the taper-check spreader passes the CWL', () => {
    const log = canal({ until: 'taper', patch: { taper: { depthMm: 21.5 } } });
    expect(only(log.evaluate(), 'taper-beyond-cwl')).toEqual([
      expect.objectContaining({ severity: 'caution', eventId: log.id('taper') }),
    ]);
    expect(codes(log.evaluate())).not.toContain('spreader-beyond-cwl');
  });

  it('is cleared by a later taper check within the CWL', () => {
    const log = canal({ until: 'taper', patch: { taper: { depthMm: 22 } } });
    log.add('taper2', 'taper.checked', { spreader: 'MF', depthMm: 20.5 });
    expect(codes(log.evaluate())).not.toContain('taper-beyond-cwl');
  });

  it('does not fire for a taper check exactly at the CWL', () => {
    const log = canal({ until: 'taper', patch: { taper: { depthMm: 21 } } });
    expect(codes(log.evaluate())).not.toContain('taper-beyond-cwl');
  });
});

describe('accessory-beyond-cwl (common practice: nothing passes the CWL, as for the spreader)', () => {
  it('stops a kept accessory cone measured past the CWL, at the tap', () => {
    const log = canal({ until: 'acc1', patch: { acc1: { lengthMm: 21.5 } } });
    expect(only(log.evaluate(), 'accessory-beyond-cwl')).toEqual([
      expect.objectContaining({ severity: 'stop', eventId: log.id('acc1') }),
    ]);
  });

  it('clears when the cone is withdrawn', () => {
    const log = canal({ until: 'acc1', patch: { acc1: { lengthMm: 21.5 } } });
    log.remove('out', 'acc1');
    expect(codes(log.evaluate())).not.toContain('accessory-beyond-cwl');
  });
});

describe('seat-not-confirmed at the tap', () => {
  it('stops at the tap when the latest seat check says the MAF goes past the CWL, before any seating', () => {
    const log = canal({ until: 'seat', patch: { seat: { result: 'advances' } } });
    expect(only(log.evaluate(), 'seat-not-confirmed')).toEqual([
      expect.objectContaining({ severity: 'stop', eventId: log.id('seat') }),
    ]);
  });

  it('stops at the tap for a seat check short of length or off the CWL', () => {
    expect(codes(canal({ until: 'seat', patch: { seat: { result: 'short' } } }).evaluate())).toContain(
      'seat-not-confirmed',
    );
    expect(codes(canal({ until: 'seat', patch: { seat: { lengthMm: 20 } } }).evaluate())).toContain(
      'seat-not-confirmed',
    );
  });

  it('is cleared by a later passing check', () => {
    const log = canal({ until: 'seat', patch: { seat: { result: 'advances' } } });
    log.add('seat2', 'seat.checked', { fileSize: '30', lengthMm: 21, result: 'seated' });
    expect(codes(log.evaluate())).not.toContain('seat-not-confirmed');
  });

  it('still stops a master cone seated with no seat check before it', () => {
    const log = canal({ omit: ['seat'] });
    expect(only(log.evaluate(), 'seat-not-confirmed')).toEqual([
      expect.objectContaining({ eventId: log.id('seated') }),
    ]);
  });
});

describe('seat-file-not-maf (common practice: the seat is checked with the MAF itself)', () => {
  it('cautions when the seat check used a file of another size than the MAF', () => {
    const log = canal({ until: 'seat', patch: { seat: { fileSize: '25' } } });
    expect(only(log.evaluate(), 'seat-file-not-maf')).toEqual([
      expect.objectContaining({ severity: 'caution', eventId: log.id('seat') }),
    ]);
  });

  it('is quiet when the file is the MAF', () => {
    expect(codes(canal({ until: 'seat' }).evaluate())).not.toContain('seat-file-not-maf');
  });
});

describe('cone-fit-retake-needed when the cone changes size', () => {
  it('cautions when the master cone is refitted in another size after the cone-fit radiograph', () => {
    const log = canal({ until: 'cone-fit-rad' });
    log.add('refit', 'master.fitted', { size: '35', lengthMm: 21, reachedLength: true });
    expect(only(log.evaluate(), 'cone-fit-retake-needed')).toEqual([
      expect.objectContaining({ severity: 'caution', eventId: log.id('refit') }),
    ]);
  });

  it('is cleared by a new cone-fit radiograph', () => {
    const log = canal({ until: 'cone-fit-rad' });
    log.add('refit', 'master.fitted', { size: '35', lengthMm: 21, reachedLength: true });
    log.add('rad2', 'radiograph.taken', { purpose: 'cone-fit' });
    expect(codes(log.evaluate())).not.toContain('cone-fit-retake-needed');
  });
});

describe('compaction.finished and compaction-incomplete', () => {
  /** A canal seated, one spreader placement at `depth` and its cone, then "finish". */
  function finishedAt(depth: number): CanalLog {
    const log = canal({ until: 'seated' });
    log.add('sp', 'spreader.placed', { spreader: 'MF', depthMm: depth });
    log.add('acc', 'accessory.placed', { size: 'MF', lengthMm: depth, reachedLength: true });
    log.add('done', 'compaction.finished', {});
    return log;
  }

  it('judges compaction when it is finished, before any sear-off', () => {
    const log = finishedAt(18);
    expect(only(log.evaluate(), 'compaction-incomplete')).toEqual([
      expect.objectContaining({ severity: 'caution', eventId: log.id('done') }),
    ]);
    expect(log.evaluate().state.compactionFinished).toBe(true);
  });

  it('raises nothing at the finish when the spreader no longer passes the coronal third', () => {
    expect(codes(finishedAt(10).evaluate())).not.toContain('compaction-incomplete');
  });

  it('withdraws the judgement when the finish is voided', () => {
    const log = finishedAt(18);
    log.void('undo', 'done');
    expect(codes(log.evaluate())).not.toContain('compaction-incomplete');
    expect(log.evaluate().state.compactionFinished).toBe(false);
  });

  it('judges again at sear-off, one finding, raised by the sear-off', () => {
    const log = finishedAt(18);
    log.add('sear', 'gp.seared', { atOrifice: true, relativeToCejMm: 0.5 });
    expect(only(log.evaluate(), 'compaction-incomplete')).toEqual([
      expect.objectContaining({ eventId: log.id('sear') }),
    ]);
  });

  it('clears when compaction goes on after the finish and the sear-off finds it complete', () => {
    const log = finishedAt(18);
    log.add('sp2', 'spreader.placed', { spreader: 'MF', depthMm: 10 });
    log.add('acc2', 'accessory.placed', { size: 'MF', lengthMm: 10, reachedLength: true });
    log.add('sear', 'gp.seared', { atOrifice: true, relativeToCejMm: 0.5 });
    expect(codes(log.evaluate())).not.toContain('compaction-incomplete');
  });
});

describe('sear-level-missing (common practice: an anterior tooth is seared at or below the CEJ)', () => {
  it('cautions when an anterior tooth is seared with no CEJ level', () => {
    const log = canal({ tooth: 11, cwlMm: 23, patch: { sear: { atOrifice: true, relativeToCejMm: undefined } } });
    expect(only(log.evaluate(), 'sear-level-missing')).toEqual([
      expect.objectContaining({ severity: 'caution', eventId: log.id('sear') }),
    ]);
  });

  it('counts a level of 0 (at the CEJ) as recorded', () => {
    const log = canal({ tooth: 11, cwlMm: 23, patch: { sear: { relativeToCejMm: 0 } } });
    expect(codes(log.evaluate())).not.toContain('sear-level-missing');
  });

  it('does not apply to a molar or a training block', () => {
    expect(codes(canal({ patch: { sear: { relativeToCejMm: undefined } } }).evaluate())).not.toContain(
      'sear-level-missing',
    );
    expect(codes(canal({ setting: 'block' }).evaluate())).not.toContain('sear-level-missing');
  });
});

describe('cwl-corrected-without-reason', () => {
  it('notes a CWL correction with an empty reason, raised by the correction', () => {
    const log = canal({ until: 'seat' });
    log.add('fix', 'canal.cwlCorrected', { cwlMm: 20.5, reason: '' });
    expect(only(log.evaluate(), 'cwl-corrected-without-reason')).toEqual([
      expect.objectContaining({ severity: 'note', eventId: log.id('fix') }),
    ]);
  });

  it('is cleared by a later correction with a reason', () => {
    const log = canal({ until: 'seat' });
    log.add('fix', 'canal.cwlCorrected', { cwlMm: 20.5, reason: '' });
    log.add('fix2', 'canal.cwlCorrected', { cwlMm: 20.5, reason: 'New radiograph: file 0.5 mm long' });
    expect(codes(log.evaluate())).not.toContain('cwl-corrected-without-reason');
  });
});

describe('unfilled canals and case-level restorations', () => {
  it('calls a canal unfilled until a master cone is seated', () => {
    expect(canal({ until: 'cone-fit-rad' }).evaluate().state.unfilled).toBe(true);
    expect(canal({ until: 'seated' }).evaluate().state.unfilled).toBe(false);
  });

  it('keeps a submitted canal with no seated cone unfilled', () => {
    const log = canal({ until: 'fit' });
    log.add('submit', 'case.submitted', {}, { caseLevel: true });
    const { state } = log.evaluate();
    expect(state.status).toBe('submitted');
    expect(state.unfilled).toBe(true);
  });

  it('restores, by a case-level restoration, only a canal already seared', () => {
    const early = canal({ until: 'fill' });
    early.add('restore', 'access.restored', { kind: 'temporary' }, { caseLevel: true });
    expect(early.evaluate().state.status).toBe('filled');

    const seared = canal({ until: 'clean' });
    seared.add('restore', 'access.restored', { kind: 'temporary' }, { caseLevel: true });
    expect(seared.evaluate().state.status).toBe('restored');
  });

  it('restores an unseared canal by a restoration recorded on the canal itself', () => {
    const log = canal({ until: 'fill' });
    log.add('restore', 'access.restored', { kind: 'temporary' });
    expect(log.evaluate().state.status).toBe('restored');
  });
});
