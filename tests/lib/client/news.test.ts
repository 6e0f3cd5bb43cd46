// The attending's news on the tablet: what a pull keeps of the case's sign-offs and comments,
// where a returned case opens, and where a canal's cone-fit check stands on the tablet.
import 'fake-indexeddb/auto';
import { IDBFactory } from 'fake-indexeddb';
import { beforeEach, describe, expect, it } from 'vitest';
import type { CanalResult, ReviewComment, Signoff } from '../../../src/lib/contract';
import type { CaseAnswer } from '../../../src/lib/client/api';
import { closeDb } from '../../../src/lib/client/db';
import { coneFitOf, landingCanal, readNews, standingReturn } from '../../../src/lib/client/news';
import { pullCase } from '../../../src/lib/client/sync';
import type { LogEvent } from '../../../src/lib/rules/index';

beforeEach(async () => {
  await closeDb();
  globalThis.indexedDB = new IDBFactory();
});

const CASE = '00000000-0000-4000-8000-00000000c0de';
const D = '00000000-0000-4000-8000-0000000000d1';
const MB = '00000000-0000-4000-8000-0000000000d2';

function signoff(over: Partial<Signoff>): Signoff {
  return {
    id: null,
    checkpoint: 'cone-fit',
    canalId: D,
    decision: 'approved',
    ratings: null,
    comment: null,
    attendingId: 4,
    attendingName: 'Dr Invented Attending',
    at: '2026-12-07T10:00:00.000Z',
    supersededAt: null,
    ...over,
  };
}

const comment: ReviewComment = {
  id: null,
  canalId: D,
  eventId: null,
  authorId: 4,
  authorName: 'Dr Invented Attending',
  authorRole: 'attending',
  text: 'Check the apical third.',
  at: '2026-12-07T10:05:00.000Z',
};

function canal(canalId: string, stops: number): CanalResult {
  return {
    canalId,
    caseId: CASE,
    state: {} as CanalResult['state'],
    findings: Array.from({ length: stops }, () => ({ code: 'taper-short', severity: 'stop', message: '…' })),
  };
}

describe('pullCase', () => {
  it("keeps a changed case's sign-offs and comments on the tablet, to be read offline", async () => {
    const answer: CaseAnswer = {
      caseId: CASE,
      reviewStatus: 'open',
      events: [],
      canals: [],
      signoffs: [signoff({})],
      comments: [comment],
    };
    const o = await pullCase(7, CASE, null, async () => ({ kind: 'ok', value: answer, etag: '"v1"' }));
    expect(o).toEqual({ kind: 'changed', etag: '"v1"', reviewStatus: 'open' });
    expect(await readNews(7, CASE)).toEqual({ signoffs: [signoff({})], comments: [comment] });
    expect(await readNews(8, CASE)).toBeUndefined();
  });

  it('keeps nothing from an older server whose answer has no sign-offs, nor from a 304', async () => {
    const old: CaseAnswer = { caseId: CASE, events: [], canals: [] };
    await pullCase(7, CASE, null, async () => ({ kind: 'ok', value: old, etag: null }));
    expect(await readNews(7, CASE)).toBeUndefined();
    expect(await pullCase(7, CASE, '"v1"', async () => ({ kind: 'status', status: 304 }))).toEqual({
      kind: 'unchanged',
    });
    expect(await readNews(7, CASE)).toBeUndefined();
  });
});

describe('standingReturn and landingCanal', () => {
  const finalReturn = signoff({ checkpoint: 'final', canalId: null, decision: 'returned', comment: 'Voids.' });

  it('open a returned case at the canal its return names', () => {
    const back = signoff({ checkpoint: 'fill-check', canalId: MB, decision: 'returned', comment: 'Redo it.' });
    const news = { signoffs: [signoff({}), back] };
    expect(standingReturn(news)).toBe(back);
    expect(landingCanal(news, [canal(D, 1), canal(MB, 0)])).toBe(MB);
  });

  it('open a case returned as a whole at the canal whose checkpoint was returned with it', () => {
    const fill = signoff({ checkpoint: 'fill-check', canalId: MB, decision: 'returned', comment: 'Voids in MB.' });
    expect(landingCanal({ signoffs: [fill, finalReturn] }, [canal(D, 1)])).toBe(MB);
    // One returned before an earlier decision on the whole case is old news.
    const earlier = signoff({ checkpoint: 'final', canalId: null, decision: 'returned', comment: 'First return.' });
    expect(landingCanal({ signoffs: [fill, earlier, finalReturn] }, [canal(D, 1)])).toBe(D);
  });

  it('open it at the first canal with an open stop when the return names none, else leave it to the tablet', () => {
    expect(landingCanal({ signoffs: [finalReturn] }, [canal(D, 0), canal(MB, 2)])).toBe(MB);
    expect(landingCanal({ signoffs: [finalReturn] }, [canal(D, 0)])).toBeNull();
  });

  it('find no standing return once the case was approved after it', () => {
    const approved = signoff({ checkpoint: 'final', canalId: null, decision: 'approved', at: '2026-12-07T11:00:00Z' });
    expect(standingReturn({ signoffs: [finalReturn, approved] })).toBeUndefined();
    expect(standingReturn(undefined)).toBeUndefined();
  });
});

describe('coneFitOf', () => {
  const ev = (type: string, data: object, at: string, canalId = D): LogEvent =>
    ({ id: `${type}-${at}`, caseId: CASE, canalId, type, at, data }) as unknown as LogEvent;

  it("reads only the canal's own records and cone-fit sign-offs", () => {
    const asked = ev('conefit.requested', {}, '2026-12-07T09:00:00.000Z');
    const elsewhere = ev('conefit.requested', {}, '2026-12-07T11:00:00.000Z', MB);
    const news = {
      signoffs: [
        signoff({ decision: 'returned', comment: 'Cone short.', at: '2026-12-07T09:30:00.000Z' }),
        signoff({ checkpoint: 'fill-check', decision: 'approved', at: '2026-12-07T10:30:00.000Z' }),
        signoff({ canalId: MB, decision: 'approved', at: '2026-12-07T12:00:00.000Z' }),
      ],
    };
    const s = coneFitOf(D, [asked, elsewhere], news);
    expect(s).toMatchObject({ status: 'returned', pending: false, approved: false });
    expect(s.signoff?.comment).toBe('Cone short.');
    expect(coneFitOf(D, [asked, elsewhere], undefined)).toMatchObject({ status: 'waiting', pending: true });
  });
});
