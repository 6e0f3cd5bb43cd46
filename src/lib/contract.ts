/**
 * The contract: everything that crosses the wire or a layer, declared once and imported by
 * the island, the endpoints, the services and the tests. Types and constants only, no zod and
 * no I/O, so the chairside island may import it (zod bodies for forms live beside the routes
 * that read them). docs/sync-contract.md is its written form. The director's forms and the case
 * list's query are zod schemas the admin islands share with the routes: they live in
 * contract-accounts.ts and contract-case-list.ts, and only their types are re-exported here.
 */
import type {
  CanalRatings,
  CanalResult,
  CaseState,
  EventOf,
  EventType,
  LogEvent,
  SignoffCheckpoint,
  SignoffDecision,
  SignoffOutcome,
} from './rules/core';
import { EVENT_TYPES } from './rules/core';

export type { CanalResult, CaseState, EventOf, EventType, LogEvent };
export { EVENT_TYPES };
export { LIMITS } from './rules/limits';
export type { Tolerances } from './rules/tolerances';
// The course settings' names, ranges and bodies are declared in settings-contract.ts (zod).
export type {
  RecomputeStatus,
  SettingName,
  SettingsAnswer,
  SettingsPut,
  StaleSettingsAnswer,
} from './settings-contract';

/**
 * The contract's version. It only grows: the server keeps accepting every event shape it
 * ever accepted (tablets run an older precached app until they update), and a tablet records
 * an event type only when the server it talks to knows it (EVENT_TYPE_SINCE).
 */
export const CONTRACT_VERSION = 3;

/** Event types added after version 1, with the version that added them. */
const ADDED: Partial<Record<EventType, number>> = {
  'compaction.finished': 2,
  'case.discarded': 2,
  'conefit.requested': 3,
  'conefit.approvedAtChair': 3,
};

/** The contract version in which each event type appeared. */
export const EVENT_TYPE_SINCE: Readonly<Record<EventType, number>> = Object.fromEntries(
  EVENT_TYPES.map((t) => [t, ADDED[t] ?? 1]),
) as Record<EventType, number>;

/** True when a server reporting `serverVersion` knows events of `type`. */
export function serverKnows(type: EventType, serverVersion: number): boolean {
  return serverVersion >= EVENT_TYPE_SINCE[type];
}

export const ROLES = ['student', 'attending', 'director'] as const;
export type Role = (typeof ROLES)[number];

/** The data an event of `type` carries, as the tablet records it (already normalised). */
export type EventData<T extends EventType> = EventOf<T>['data'];

// --- POST /api/sync -------------------------------------------------------------------

/** The body of POST /api/sync. `userId` names the account whose outbox the batch comes from. */
export interface SyncBatch {
  deviceId: string;
  userId?: number;
  events: unknown[];
}

/** Each event's fate, in the batch's order. */
export type SyncResult =
  | { id: string | null; status: 'stored' | 'duplicate' }
  | { id: string | null; status: 'rejected'; error: string; retry?: true };

/** The answer of POST /api/sync. */
export interface SyncAnswer {
  /** The server's CONTRACT_VERSION. */
  contractVersion: number;
  results: SyncResult[];
  /** The full, recomputed state and open findings of every canal the batch touched. */
  canals: CanalResult[];
  /**
   * The settings version that judged the batch (GET /api/settings names the same version).
   * Added with the settings screen; absent from older servers.
   */
  settingsVersion?: number;
}

// --- reading back ---------------------------------------------------------------------

export type CaseSetting = 'block' | 'extracted' | 'patient';
export type ReviewStatus = 'open' | 'submitted' | 'approved' | 'returned';

/** One case in a list (GET /api/cases, the home pages): the same shape everywhere. */
export interface CaseSummary {
  caseId: string;
  studentId: number;
  studentName: string;
  setting: CaseSetting;
  tooth: number | null;
  chartRef: string | null;
  openedAt: string;
  submittedAt: string | null;
  submitted: boolean;
  reviewStatus: ReviewStatus;
  stops: number;
  cautions: number;
  notes: number;
  canals: { canalId: string; name: string; status: string }[];
}

/** GET /api/cases/{caseId}: every event of the case and its canals' state. */
export interface CaseDetail {
  caseId: string;
  /** Added with the conditional pull; absent from older servers, so readers must not rely on it. */
  reviewStatus?: ReviewStatus;
  events: LogEvent[];
  canals: CanalResult[];
  /** Added with review (issue 11): every sign-off, oldest first. Absent from older servers. */
  signoffs?: Signoff[];
  /** Added with review (issue 11): every comment, oldest first. Absent from older servers. */
  comments?: ReviewComment[];
  /** The settings version in force (GET /api/settings). Added with the settings screen; absent from older servers. */
  settingsVersion?: number;
}

// --- review: sign-offs and comments (docs/review.md) ----------------------------------

export { SIGNOFF_CHECKPOINTS, SIGNOFF_DECISIONS, RATING_KEYS, RATING_LEVELS } from './rules/core';
export type {
  SignoffCheckpoint,
  SignoffDecision,
  SignoffOutcome,
  RatingKey,
  RatingLevel,
  CanalRatings,
} from './rules/core';

/** The body of POST /api/cases/{caseId}/signoffs. */
export interface SignoffRequest {
  /** Made by the client (UUID); the same id again answers the first answer. */
  id: string;
  checkpoint: SignoffCheckpoint;
  /** Required for `cone-fit` and `fill-check`; absent for `final`. */
  canalId?: string;
  decision: SignoffDecision;
  /** By canal id. */
  ratings?: Record<string, CanalRatings>;
  /** Required on a return (≤ 2,000 characters). */
  comment?: string;
  /** The case state the attending saw; 409 when it changed since. */
  expectedState: CaseState;
}

/** The body of POST /api/cases/{caseId}/reopen. */
export interface ReopenRequest {
  id: string;
  reason: string;
  /** Optional: the case state the attending saw; 409 when it changed since. */
  expectedState?: CaseState;
}

/** The body of POST /api/cases/{caseId}/comments. */
export interface CommentRequest {
  id: string;
  canalId?: string;
  eventId?: string;
  /** Trimmed, 1–2,000 characters. */
  text: string;
}

/** One sign-off as readers see it; never changed once written, except being superseded. */
export interface Signoff {
  /** The client-made id; null on sign-offs made before they were an API. */
  id: string | null;
  checkpoint: SignoffCheckpoint;
  canalId: string | null;
  decision: SignoffOutcome;
  ratings: Record<string, CanalRatings> | null;
  comment: string | null;
  attendingId: number;
  attendingName: string;
  at: string;
  /** A final approval a reopening superseded: when. */
  supersededAt: string | null;
}

/** One comment, anchored to the case, a canal or an event. */
export interface ReviewComment {
  id: string | null;
  canalId: string | null;
  eventId: string | null;
  authorId: number;
  authorName: string;
  authorRole: Role;
  text: string;
  at: string;
}

/** The answer of POST …/signoffs and …/reopen. */
export interface SignoffAnswer {
  caseId: string;
  reviewStatus: ReviewStatus;
  signoff: Signoff;
}

/** The answer of POST …/comments. */
export interface CommentAnswer {
  caseId: string;
  comment: ReviewComment;
}

// --- review queue: GET /api/review/queue (docs/review.md, "The queue") ------------------

/** The canal-level events a cone-fit item comes from (their data: `{}` and `{ attendingId }`). */
export const CONEFIT_EVENT_TYPES = ['conefit.requested', 'conefit.approvedAtChair'] as const;

/** Which cases the queue lists: `needs-action` (the default) is what waits for an attending now. */
export const QUEUE_STATES = ['needs-action', 'open', 'returned', 'approved', 'all'] as const;
export type QueueState = (typeof QUEUE_STATES)[number];

/** The queue's orders: `waiting` (longest waiting first, the default), `student`, `tooth`, `stops` (most first). */
export const QUEUE_SORTS = ['waiting', 'student', 'tooth', 'stops'] as const;
export type QueueSort = (typeof QUEUE_SORTS)[number];

/** Tooth groups by FDI number: anterior x1–x3, premolar x4–x5 (permanent), molar the rest. */
export const TOOTH_GROUPS = ['anterior', 'premolar', 'molar'] as const;
export type ToothGroupName = (typeof TOOTH_GROUPS)[number];

/** Rows in one page of the queue. */
export const QUEUE_PAGE_SIZE = 50;

/** The query of GET /api/review/queue, each field optional (defaults: needs-action, waiting). */
export interface QueueQuery {
  state?: QueueState;
  /** A student's user id. */
  student?: number;
  toothGroup?: ToothGroupName;
  hasStops?: boolean;
  /** A chart number, or its beginning (any case). */
  q?: string;
  sort?: QueueSort;
  /** The `nextCursor` of the page before. */
  cursor?: string;
}

/** A cone-fit item waiting for the attending: a request to approve, or an approval at the chair to confirm. */
export interface ConeFitItem {
  canalId: string;
  canalName: string;
  /** `requested`: the student asks for approval; `at-chair`: the student recorded an approval given at the chair. */
  kind: 'requested' | 'at-chair';
  eventId: string;
  /** The event's `at` (the tablet's clock). */
  recordedAt: string;
  /** For `at-chair`: the attending the student named, and their name when the id is a known attending. */
  attendingId?: string;
  attendingName?: string | null;
}

/** Since when a row has waited, and for what. */
export type QueueSinceKind = 'submitted' | 'cone-fit' | 'returned' | 'approved' | 'opened';

/** One case in the queue. */
export interface QueueRow {
  caseId: string;
  student: { id: number; name: string };
  /** FDI number; null for a training block. */
  tooth: number | null;
  setting: CaseSetting;
  /** Shown to clinical staff only; never put in a link. */
  chartRef: string | null;
  state: ReviewStatus;
  /** Live canals. */
  canals: number;
  /** When the row began waiting: the submission or the oldest pending cone-fit item (whichever came first); for rows not waiting, when they were returned, signed off or opened. */
  since: { at: string; kind: QueueSinceKind };
  submittedAt: string | null;
  stops: number;
  cautions: number;
  /** Live canals with no seated master cone. */
  unfilled: number;
  coneFits: ConeFitItem[];
}

/** The answer of GET /api/review/queue. */
export interface QueueAnswer {
  rows: QueueRow[];
  /** Opaque; send it back as `cursor` for the next page. Null on the last page. */
  nextCursor: string | null;
}

/** The clinic's time zone and locale (CLINIC_TIME_ZONE, CLINIC_LOCALE), for showing dates and times. */
export interface Clinic {
  timeZone: string;
  locale: string;
}

/** An attending a student may name (the student's assigned attendings). */
export interface AttendingRef {
  id: number;
  name: string;
}

/** GET /api/me: the signed-in user, the installation's demo mode, the clinic, the contract version. */
export interface MeAnswer {
  id: number;
  email: string;
  name: string;
  role: Role;
  demo: boolean;
  clinic: Clinic;
  contractVersion: number;
  /**
   * Added with the cone fit at the chair (contract version 3); absent from older servers. A
   * student's active assigned attendings, by name (the tablet keeps them for recording an
   * approval at the chair offline); empty for other roles.
   */
  attendings?: AttendingRef[];
  /** Added with contract version 3: the course setting `requireConeFitApproval` is 1. */
  requireConeFitApproval?: boolean;
}

/** Every error answer of the API. */
export interface ErrorAnswer {
  error: string;
  code?: string;
  field?: string;
}

// --- accounts, cohorts, assignments and the case list (docs/accounts.md) -----------------
// The zod schemas are in contract-accounts.ts and contract-case-list.ts; types only here.

export type {
  AccountSummary,
  AccountsAnswer,
  ActiveAnswer,
  AssignmentsAnswer,
  AssignmentsChange,
  CohortAnswer,
  CohortCreate,
  CohortMove,
  CohortMoveAnswer,
  CohortsAnswer,
  CohortSummary,
  CohortUpdate,
  HoldsAnswer,
  PersonRef,
  RoleAnswer,
  RoleChange,
  StudentToReassign,
  UserAction,
} from './contract-accounts';
export type { CaseListAnswer, CaseListQuery, CaseListState } from './contract-case-list';
