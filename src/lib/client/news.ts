import { useEffect, useState } from 'react';
import type { CanalResult, ReviewComment, Signoff } from '../contract';
import { coneFitStanding, type ConeFitStanding, type LogEvent } from '../rules/core';
import { fetchCase } from './api';
import { getMeta, setMeta } from './outbox';
import { useChairside } from './store';

/**
 * What the attending said about a case, as the tablet keeps it: the sign-offs and comments of
 * the case's answer (GET /api/cases/{caseId}), written by each pull (sync.ts) under
 * `[userId, 'news', caseId]`, so they read offline too. Loaded with the panels that show it,
 * never with the first paint.
 */
export interface CaseNews {
  signoffs: Signoff[];
  comments?: ReviewComment[];
}

const key = (userId: number, caseId: string) => [userId, 'news', caseId];

/** The news kept on this tablet for a case, if any. */
export function readNews(userId: number, caseId: string): Promise<CaseNews | undefined> {
  return getMeta<CaseNews>(key(userId, caseId));
}

/**
 * Asks the server for the case and keeps its news (a case the tablet does not pull, such as one
 * on the case list). Answers the news and the server's canals; undefined offline, or from a
 * server with no sign-offs in its answer.
 */
export async function fetchNews(
  userId: number,
  caseId: string,
): Promise<{ news: CaseNews; canals: CanalResult[] } | undefined> {
  const a = await fetchCase(caseId);
  if (a.kind !== 'ok' || !a.value.signoffs) return undefined;
  const news: CaseNews = { signoffs: a.value.signoffs, comments: a.value.comments ?? [] };
  await setMeta(key(userId, caseId), news);
  return { news, canals: a.value.canals };
}

/**
 * The case's news, read again whenever the tablet reloads the server's verdicts (after each
 * pull that brought something): what a panel shows. Undefined until read, or when none is kept.
 */
export function useNews(caseId: string | null): CaseNews | undefined {
  const userId = useChairside((s) => s.identity.user?.id);
  // A new object after every reload, so a pull's news are read as soon as they are kept.
  const server = useChairside((s) => s.server);
  const [news, setNews] = useState<{ caseId: string; news: CaseNews | undefined } | null>(null);
  useEffect(() => {
    if (userId === undefined || caseId === null) return;
    let live = true;
    void readNews(userId, caseId).then((n) => {
      if (live) setNews({ caseId, news: n });
    });
    return () => {
      live = false;
    };
  }, [userId, caseId, server]);
  return news?.caseId === caseId ? news.news : undefined;
}

/** The latest return of any checkpoint, if it is the attending's latest decision on the case. */
export function standingReturn(news: CaseNews | undefined): Signoff | undefined {
  const decided = (news?.signoffs ?? []).filter((s) => s.checkpoint === 'final' || s.decision === 'returned');
  const last = decided.at(-1);
  return last?.decision === 'returned' ? last : undefined;
}

/**
 * Where a returned case opens: the canal its return names — a return of the whole case names
 * none, so the latest checkpoint return given since the attending's previous decision on the
 * whole case — else the first canal (in the order given) with an open stop, else null (the
 * tablet's own choice, its first canal).
 */
export function landingCanal(news: CaseNews | undefined, canals: readonly CanalResult[]): string | null {
  const back = standingReturn(news);
  const signoffs = news?.signoffs ?? [];
  for (let i = back ? signoffs.indexOf(back) : -1; i >= 0; i--) {
    const s = signoffs[i]!;
    if (s.canalId && s.decision === 'returned') return s.canalId;
    if (s !== back && s.checkpoint === 'final') break;
  }
  return canals.find((c) => c.findings.some((f) => f.severity === 'stop'))?.canalId ?? null;
}

/**
 * Where one canal's cone-fit check stands (docs/review.md, "Cone fit at the chair"): its own
 * events that count, and its `cone-fit` sign-offs from the news.
 */
export function coneFitOf(
  canalId: string,
  counted: readonly LogEvent[],
  news: CaseNews | undefined,
): ConeFitStanding<Signoff & { decision: 'approved' | 'returned' }> {
  const signoffs = (news?.signoffs ?? []).filter(
    (s): s is Signoff & { decision: 'approved' | 'returned' } =>
      s.checkpoint === 'cone-fit' && s.canalId === canalId && s.decision !== 'reopened',
  );
  return coneFitStanding(
    counted.filter((e) => e.canalId === canalId),
    signoffs,
  );
}
