import type { AttendingRef, CaseDetail, CaseSummary, Clinic, MeAnswer, Role, SyncAnswer } from '../contract';
import type { LogEvent } from '../rules/core';

export type { CaseSummary, MeAnswer, SyncAnswer };
export type { ReviewStatus } from '../contract';

/** The signed-in user as the tablet keeps them. */
export interface Me {
  id: number;
  email?: string;
  name: string;
  role: Role;
  /** The clinic's time zone and locale, kept with the user so the tablet shows times offline too. */
  clinic?: Clinic;
  /** A student's assigned attendings and whether the course asks for a cone-fit approval (contract version 3), kept for offline use. */
  attendings?: AttendingRef[];
  requireConeFitApproval?: boolean;
}

/** What came back: a value, "not signed in", or no answer at all (offline, server down). */
export type Answer<T> =
  | { kind: 'ok'; value: T; etag?: string | null }
  | { kind: 'status'; status: number; error?: string; code?: string }
  | { kind: 'offline'; error: string };

async function call<T>(path: string, init?: RequestInit): Promise<Answer<T>> {
  let res: Response;
  try {
    res = await fetch(path, { credentials: 'same-origin', cache: 'no-store', ...init });
  } catch (e) {
    return { kind: 'offline', error: e instanceof Error ? e.message : String(e) };
  }
  if (res.ok) {
    try {
      return { kind: 'ok', value: (await res.json()) as T, etag: res.headers.get('etag') };
    } catch {
      return { kind: 'status', status: res.status, error: 'The server sent something that is not JSON' };
    }
  }
  let body: { error?: string; code?: string } = {};
  try {
    body = (await res.json()) as { error?: string; code?: string };
  } catch {
    /* no body */
  }
  return { kind: 'status', status: res.status, error: body.error, ...(body.code ? { code: body.code } : {}) };
}

export function fetchMe(): Promise<Answer<MeAnswer>> {
  return call<MeAnswer>('/api/me');
}

/** POSTs a batch as JSON (the server requires it, and checks Origin too); `userId` (the outbox's owner) makes the server refuse it under anyone else's session. */
export function postSync(deviceId: string, events: LogEvent[], userId?: number): Promise<Answer<SyncAnswer>> {
  return call<SyncAnswer>('/api/sync', {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify(userId === undefined ? { deviceId, events } : { deviceId, userId, events }),
  });
}

export function fetchCases(): Promise<Answer<{ cases: CaseSummary[] }>> {
  return call('/api/cases');
}

/** What GET /api/cases/{caseId} answers (reviewStatus since the conditional GET; absent from older servers). */
export type CaseAnswer = CaseDetail;

export function fetchCase(caseId: string): Promise<Answer<CaseAnswer>> {
  return call(`/api/cases/${encodeURIComponent(caseId)}`);
}

/**
 * GET the case with If-None-Match `etag` (docs/sync-contract.md, "Reading back"): status 304
 * means unchanged, and costs the server one query and no body. The browser never caches the
 * answer (no-store), so the tablet's own tag is the only validator.
 */
export function fetchCaseIfChanged(caseId: string, etag: string | null): Promise<Answer<CaseAnswer>> {
  return call(`/api/cases/${encodeURIComponent(caseId)}`, etag ? { headers: { 'If-None-Match': etag } } : undefined);
}
