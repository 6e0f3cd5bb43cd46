import { tallyEvent, tallyOf, type CanalResult, type LogEvent } from '../rules/core';
import { caseEvents } from './derive';
import type { ReviewStatus } from './api';
import type { TabletCase } from './derive';
import type { ServerCanal, StoredEvent } from './outbox';

export interface ShownResult {
  result: CanalResult | null;
  source: 'server' | 'tablet';
}

/**
 * The canal's state and findings to show: the server's verdict once everything of the case
 * has reached it, the rules core's local verdict (`local`, memoised in the store) while
 * anything is still waiting.
 */
export function shownResult(
  rows: StoredEvent[],
  server: Record<string, ServerCanal>,
  local: CanalResult | null,
  caseId: string,
  canalId: string,
): ShownResult {
  const waiting = rows.some(
    (r) => r.state === 'queued' && r.event.caseId === caseId && (!r.event.canalId || r.event.canalId === canalId),
  );
  const fromServer = server[canalId]?.result;
  if (!waiting && fromServer) return { result: fromServer, source: 'server' };
  return { result: local, source: 'tablet' };
}

/** Rejected events of one case, with the server's reason. */
export function rejectedIn(rows: StoredEvent[], caseId: string | null): StoredEvent[] {
  return rows.filter((r) => r.state === 'rejected' && (!caseId || r.event.caseId === caseId));
}

/**
 * Why recording `e` would pass a limit of the case (limits.ts), in the words the server would
 * use; null when it fits. Rejected events were never stored, so they do not count.
 */
export function limitRefusal(rows: StoredEvent[], e: LogEvent): string | null {
  return tallyOf(caseEvents(rows, e.caseId)).breach(tallyEvent(e))?.error ?? null;
}

/**
 * Why the tablet records nothing in this case now, or null when it may: a standing submission
 * the attending has not returned (docs/lifecycle.md), or a signed-off case. The server refuses
 * such steps too; blocking them here keeps offline taps from turning into refusals later.
 */
export function lockOf(tablet: TabletCase, review: ReviewStatus | undefined): 'submitted' | 'approved' | null {
  if (review === 'approved') return 'approved';
  if (tablet.info?.submitted && review !== 'returned') return 'submitted';
  return null;
}
