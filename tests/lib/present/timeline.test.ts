import { describe, expect, it } from 'vitest';
import { raisedBy, timelineLines } from '../../../src/lib/present/timeline';
import type { Finding } from '../../../src/lib/rules/core';

const clinic = { timeZone: 'Europe/London', locale: 'en-GB' };
const ev = (id: string, type: string, data: object, at = '2026-03-02T09:15:00Z') => ({ id, type, data, at });

describe('timelineLines', () => {
  const taper = ev('t1', 'taper.checked', { spreader: 'MF', depthMm: 17 }, '2026-03-02T09:10:00Z');
  const cone = ev('a1', 'accessory.placed', { size: 'MF', lengthMm: 15, reachedLength: false });
  const removal = ev('r1', 'accessory.removed', { eventId: 'a1', reason: 'stopped short' });
  const open: Finding[] = [{ code: 'taper-short', severity: 'stop', eventId: 't1', message: '…' }];
  const history = [
    { code: 'taper-short', severity: 'stop' as const, eventId: 't1', raisedAt: 'x', clearedAt: null },
    {
      code: 'accessory-short',
      severity: 'stop' as const,
      eventId: 'a1',
      raisedAt: '2026-03-02T09:15:00Z',
      clearedAt: '2026-03-02T09:16:00Z',
    },
  ];

  it('puts each finding beside the event that raised it, open or put right since', () => {
    const lines = timelineLines([taper, cone, removal], open, history, clinic);
    expect(lines.map((l) => [l.time, l.words])).toEqual([
      ['09:10', 'Taper check, spreader MF: 17.0 mm'],
      ['09:15', 'Accessory cone MF: 15.0 mm, stopped short'],
      ['09:15', 'Removed: Accessory cone MF: 15.0 mm, stopped short (stopped short)'],
    ]);
    expect(lines[0]!.findings).toEqual([
      { code: 'taper-short', severity: 'stop', title: 'Taper check short of the CWL', cleared: null },
    ]);
    expect(lines[1]!.findings).toEqual([
      {
        code: 'accessory-short',
        severity: 'stop',
        title: 'Accessory cone stopped short',
        cleared: '2 Mar 2026, 09:16',
      },
    ]);
    expect(lines[2]!.findings).toEqual([]);
  });

  it('strikes a withdrawn event, and names the canal of a finding a case-level step raised', () => {
    const submitted = ev('s1', 'case.submitted', {});
    const voided = ev('v1', 'event.voided', { eventId: 't1', reason: 'misread' });
    const lines = timelineLines(
      [taper, voided, submitted],
      [{ code: 'restoration-missing', severity: 'caution', eventId: 's1', message: '…', canal: 'MB canal' }],
      [],
      clinic,
    );
    expect(lines[0]!.withdrawn).toBe(true);
    expect(lines[1]!.withdrawn).toBe(false);
    expect(lines[2]!.findings.map((f) => f.title)).toEqual(['Access not restored (MB canal)']);
    expect(raisedBy(lines[2])).toBe('09:15 · Submitted for review');
    expect(raisedBy(undefined)).toBeNull();
  });
});
