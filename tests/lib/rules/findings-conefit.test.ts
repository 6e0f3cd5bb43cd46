// The cone fit at the chair (docs/review.md): cone-fit-not-approved, judged from the canal's
// events and its cone-fit sign-offs, only while the course asks for the approval; and where a
// canal's cone-fit check stands (the pending rule the review queue shares).
import { describe, expect, it } from 'vitest';
import { coneFitStanding, evaluateCanal, type ConeFitSignoff, type LogEvent } from '../../../src/lib/rules';
import { canal, only, type CanalLog } from './builder';

const ON = { requireConeFitApproval: 1 };

/** An instant `s` seconds after the step `key` of the log (negative: before it). */
function around(log: CanalLog, key: string, s: number): string {
  const at = log.events.find((e) => e.id === log.id(key))!.at;
  return new Date(Date.parse(at) + s * 1000).toISOString();
}

const signoff = (decision: ConeFitSignoff['decision'], at: string): ConeFitSignoff => ({ decision, at });

function judge(log: CanalLog, signoffs: ConeFitSignoff[] = [], tolerances: Record<string, number> = ON) {
  const r = evaluateCanal(log.canalId, log.events, tolerances, { coneFit: signoffs });
  if (r === null) throw new Error('canal not evaluated');
  return only(r, 'cone-fit-not-approved');
}

/** The canal's events that count (voids applied), as the tablet's reading holds them. */
function counted(log: CanalLog): LogEvent[] {
  const voided = new Set(
    log.events.filter((e) => e.type === 'event.voided').map((e) => (e.data as { eventId: string }).eventId),
  );
  return log.events.filter((e) => e.type !== 'event.voided' && !voided.has(e.id));
}

describe('cone-fit-not-approved', () => {
  it('is never raised while the setting is off, approved or not', () => {
    expect(judge(canal(), [], {})).toEqual([]);
    expect(judge(canal(), [], { requireConeFitApproval: 0 })).toEqual([]);
  });

  it('stops a canal sealed with no approval while the setting is on, at the seating', () => {
    const log = canal();
    const [f] = judge(log);
    expect(f).toMatchObject({ severity: 'stop', eventId: log.id('seated') });
    expect(f?.message).toMatch(/before your attending approved the cone fit/);
  });

  it('raises nothing before the master cone is seated', () => {
    expect(judge(canal({ until: 'cone-fit-rad' }))).toEqual([]);
  });

  it('is satisfied by a cone-fit approval signed before the sealing', () => {
    const log = canal();
    expect(judge(log, [signoff('approved', around(log, 'seated', -30))])).toEqual([]);
  });

  it('stays raised when the approval comes after the sealing', () => {
    const log = canal();
    expect(judge(log, [signoff('approved', around(log, 'seated', 30))])).toHaveLength(1);
  });

  it('stops a canal sealed after the attending returned the cone fit, saying so', () => {
    const log = canal();
    const [f] = judge(log, [
      signoff('approved', around(log, 'seated', -50)),
      signoff('returned', around(log, 'seated', -20)),
    ]);
    expect(f?.message).toMatch(/after your attending returned the cone fit/);
  });

  it('counts an approval at the chair recorded before the sealing while it is not confirmed yet', () => {
    const log = canal();
    log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    expect(judge(log)).toEqual([]);
  });

  it('counts an approval at the chair the attending confirmed later', () => {
    const log = canal();
    log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    expect(judge(log, [signoff('approved', around(log, 'seated', 3600))])).toEqual([]);
  });

  it('does not count an approval at the chair the attending disputed, even after the sealing', () => {
    const log = canal();
    log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    const [f] = judge(log, [signoff('returned', around(log, 'seated', 3600))]);
    expect(f).toMatchObject({ eventId: log.id('seated') });
    expect(f?.message).toMatch(/disputes the approval at the chair/);
  });

  it('judges a confirmation then a dispute by the later of the two', () => {
    const log = canal();
    log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    const confirmed = signoff('approved', around(log, 'seated', 600));
    expect(judge(log, [confirmed, signoff('returned', around(log, 'seated', 1200))])).toHaveLength(1);
    expect(judge(log, [signoff('returned', around(log, 'seated', 300)), confirmed])).toEqual([]);
  });

  it('takes no sign-off made before the server received an approval at the chair as its answer', () => {
    const log = canal();
    const chair = log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    const early = signoff('returned', around(log, 'seated', 1200));
    const received = { [chair.id]: around(log, 'seated', 3600) };
    expect(judge(log, [early])).toHaveLength(1);
    const r = evaluateCanal(log.canalId, log.events, ON, { coneFit: [early], received })!;
    expect(only(r, 'cone-fit-not-approved')).toEqual([]);
    expect(coneFitStanding(counted(log), [early], received)).toMatchObject({ status: 'at-chair', pending: true });
    // A return after the server received it is a dispute.
    const late = signoff('returned', around(log, 'seated', 4000));
    expect(
      only(evaluateCanal(log.canalId, log.events, ON, { coneFit: [early, late], received })!, 'cone-fit-not-approved'),
    ).toHaveLength(1);
  });

  it('does not count a withdrawn approval at the chair, nor a request alone', () => {
    const log = canal();
    log.add('req', 'conefit.requested', {}, { after: 'cone-fit-rad' });
    log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' }, { after: 'cone-fit-rad' });
    log.add('undo', 'event.voided', { eventId: log.id('chair'), reason: 'mistaken tap' }, { after: 'cone-fit-rad' });
    expect(judge(log)).toHaveLength(1);
  });

  it('clears when the cone is seated again after an approval', () => {
    const log = canal();
    const approval = signoff('approved', around(log, 'seated', 30));
    expect(judge(log, [approval])).toHaveLength(1);
    log.add('reseat', 'master.seated', { sealer: 'epoxy-resin' });
    expect(judge(log, [approval])).toEqual([]);
  });

  it('applies to a training block too, and is listed among the stops', () => {
    const log = canal({ setting: 'block', patch: { seat: { lengthMm: 20 } } });
    const r = evaluateCanal(log.canalId, log.events, ON, { coneFit: [] })!;
    const rank = { stop: 0, caution: 1, note: 2 };
    const ranks = r.findings.map((f) => rank[f.severity]);
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b));
    expect(only(r, 'cone-fit-not-approved')).toHaveLength(1);
    expect(only(r, 'seat-not-confirmed')).toHaveLength(1);
  });

  it('leaves every other finding as the events alone decide them', () => {
    const log = canal({ patch: { taper: { depthMm: 18 } } });
    const without = evaluateCanal(log.canalId, log.events)!;
    const withIt = evaluateCanal(log.canalId, log.events, ON, { coneFit: [] })!;
    expect(withIt.findings.filter((f) => f.code !== 'cone-fit-not-approved')).toEqual(without.findings);
    expect(withIt.state).toEqual(without.state);
  });
});

describe('coneFitStanding', () => {
  it('is none before anything is asked or decided', () => {
    expect(coneFitStanding(counted(canal()), [])).toMatchObject({ status: 'none', pending: false, approved: false });
  });

  it('waits on a request until the attending signs the cone fit off, then shows the decision', () => {
    const log = canal({ until: 'cone-fit-rad' });
    const req = log.add('req', 'conefit.requested', {});
    expect(coneFitStanding(counted(log), [])).toMatchObject({ status: 'waiting', pending: true, record: req });
    const returned = signoff('returned', around(log, 'req', 30));
    expect(coneFitStanding(counted(log), [returned])).toMatchObject({
      status: 'returned',
      pending: false,
      signoff: returned,
      approved: false,
    });
    log.add('again', 'conefit.requested', {});
    expect(coneFitStanding(counted(log), [returned])).toMatchObject({ status: 'waiting', pending: true });
    const approved = signoff('approved', around(log, 'again', 60));
    expect(coneFitStanding(counted(log), [returned, approved])).toMatchObject({ status: 'approved', approved: true });
  });

  it('shows an approval at the chair as unconfirmed until a cone-fit sign-off after it', () => {
    const log = canal({ until: 'cone-fit-rad' });
    const chair = log.add('chair', 'conefit.approvedAtChair', { attendingId: '4' });
    expect(coneFitStanding(counted(log), [])).toMatchObject({
      status: 'at-chair',
      pending: true,
      record: chair,
      approved: true,
    });
    expect(coneFitStanding(counted(log), [signoff('returned', around(log, 'chair', 60))])).toMatchObject({
      status: 'returned',
      pending: false,
      approved: false,
    });
    expect(coneFitStanding(counted(log), [signoff('approved', around(log, 'chair', 60))])).toMatchObject({
      status: 'approved',
      pending: false,
      approved: true,
    });
  });

  it('keeps a sign-off older than the request from ending the wait', () => {
    const log = canal({ until: 'cone-fit-rad' });
    const early = signoff('approved', around(log, 'cone-fit-rad', -30));
    log.add('req', 'conefit.requested', {});
    expect(coneFitStanding(counted(log), [early])).toMatchObject({ status: 'waiting', pending: true, approved: true });
  });
});
