import { create } from 'zustand';
import { serverKnows, type EventData, type EventType } from '../contract';
import { parseEvent, type LogEvent } from '../rules/core';
import { fetchCase, type ReviewStatus } from './api';
import { CanalMemo, deriveCase, NO_CASE, type TabletCase } from './derive';
import { newId } from './ids';
import {
  dismissRejected,
  getMeta,
  importSynced,
  listEvents,
  listServerCanals,
  putEvent,
  putServerCanals,
  setMeta,
  type ServerCanal,
  type StoredEvent,
} from './outbox';
import { deviceId as loadDeviceId, leave, resolveIdentity, type Identity } from './session';
import type { Persistence } from './storage';
import { SyncLoop, type SyncStatus } from './syncLoop';
import { RepeatFilter } from './tapGuard';
import { limitRefusal } from './views';

/** What the undo strip offers to withdraw: a recorded event, or a tablet-only mark. */
export interface UndoItem {
  key: number;
  label: string;
  eventId?: string;
  canalId?: string;
  finishedCanal?: string;
}
/** The value just entered, shown big beside its verdict. */
export interface LastEntry {
  eventId: string;
  canalId?: string;
  label: string;
  value: string;
}

export interface RecordOptions {
  canalId?: string;
  label: string;
  value?: string;
  caseId?: string;
}

interface Marks {
  finished: Record<string, boolean>;
}

export interface ChairsideState {
  phase: 'loading' | 'ready';
  identity: Identity;
  deviceId: string;
  rows: StoredEvent[];
  server: Record<string, ServerCanal>;
  caseId: string | null;
  /** The open case as the rules core reads it; recomputed when `rows` or `caseId` change, per canal only where its events did. */
  tablet: TabletCase;
  /** Each case's review status as the server last answered it (pulled while the case is open). */
  reviews: Record<string, ReviewStatus>;
  /** Where a returned case opens: the canal its return names, or the first with a stop (set by the case list's mark, CaseNews.tsx). */
  landing?: Record<string, string>;
  /** Whether the browser keeps the outbox under storage pressure (asked after sign-in). */
  persistence: Persistence | null;
  canalId: string | null;
  marks: Marks;
  replaceSpreader: Record<string, boolean>;
  undo: UndoItem | null;
  last: LastEntry | null;
  error: string | null;
  sync: SyncStatus;
  showUniversal: boolean;
  /** Bumped after each durable save (tests and the benchmark watch it). */
  saved: number;

  init(): Promise<void>;
  reload(): Promise<void>;
  /** Records one event: the data is typed per event type (docs/sync-contract.md). */
  record<T extends EventType>(type: T, data: EventData<T>, opts: RecordOptions): Promise<LogEvent | null>;
  undoLast(): Promise<void>;
  clearUndo(): void;
  openCase(caseId: string | null, canalId?: string | null): void;
  selectCanal(canalId: string | null): void;
  setFinished(canalId: string, finished: boolean): void;
  setReplaceSpreader(canalId: string, on: boolean): void;
  toggleUniversal(): void;
  syncNow(): Promise<void>;
  restoreCase(caseId: string): Promise<boolean>;
  dismiss(eventId: string): Promise<void>;
  /** Try a last sync, then count what is still unsent. */
  unsentBeforeSignOut(): Promise<number>;
  /** Forget this user on the tablet (clearing their data if all of it was sent). */
  leaveTablet(): Promise<void>;
}

let loop: SyncLoop | null = null;
let kickTimer: ReturnType<typeof setTimeout> | null = null;
let undoKey = 0;
const repeats = new RepeatFilter();

export const useChairside = create<ChairsideState>((set, get) => {
  const uid = () => get().identity.user?.id ?? null;
  const remember = () => {
    const id = uid();
    if (id !== null) void setMeta([id, 'current'], { caseId: get().caseId, canalId: get().canalId });
  };
  const kickSoon = () => {
    if (kickTimer) clearTimeout(kickTimer);
    kickTimer = setTimeout(() => {
      void loop?.kick(false);
    }, 600);
  };

  return {
    phase: 'loading',
    identity: { user: null, source: null, signedOut: false, demo: false, serverContract: 1 },
    deviceId: '',
    rows: [],
    server: {},
    caseId: null,
    tablet: NO_CASE,
    reviews: {},
    persistence: null,
    canalId: null,
    marks: { finished: {} },
    replaceSpreader: {},
    undo: null,
    last: null,
    error: null,
    sync: { phase: 'idle' },
    showUniversal: false,
    saved: 0,

    async init() {
      const [dev, identity] = await Promise.all([loadDeviceId(), resolveIdentity()]);
      set({ deviceId: dev, identity });
      const id = identity.user?.id;
      if (id !== undefined) {
        const current = await getMeta<{ caseId: string | null; canalId: string | null }>([id, 'current']);
        const marks = (await getMeta<Marks>([id, 'marks'])) ?? { finished: {} };
        const reviews = (await getMeta<Record<string, ReviewStatus>>([id, 'reviews'])) ?? {};
        set({ caseId: current?.caseId ?? null, canalId: current?.canalId ?? null, marks, reviews });
        await get().reload();
      }
      set({ phase: 'ready' });
      if (id !== undefined && identity.source === 'server') {
        // Asked once the tablet is open; its code loads then, not with the first paint.
        void import('./storage').then((m) => m.askToKeepData(id)).then((persistence) => set({ persistence }));
      }
      if (!loop && id !== undefined) {
        loop = new SyncLoop({
          deviceId: dev,
          userId: uid,
          // From the rows in memory: deciding whether there is work reads no IndexedDB.
          pending: () => get().rows.filter((r) => r.state === 'queued').length,
          pullCaseId: () => {
            const { caseId, rows } = get();
            // A case the server has seen: one of its events was answered stored.
            return caseId && rows.some((r) => r.event.caseId === caseId && r.state === 'synced') ? caseId : null;
          },
          onStatus: (s) => set({ sync: { ...s } }),
          onOutcome: (o) => {
            if (o.kind === 'signed-out') set({ identity: { ...get().identity, signedOut: true } });
            void get().reload();
          },
          onPulled: (caseId, o) => {
            if (o.kind !== 'changed') return;
            if (o.reviewStatus && get().reviews[caseId] !== o.reviewStatus) {
              const reviews = { ...get().reviews, [caseId]: o.reviewStatus };
              set({ reviews });
              void setMeta([id, 'reviews'], reviews);
            }
            void get().reload();
          },
        });
        loop.start();
      }
    },

    async reload() {
      const id = uid();
      if (id === null) return;
      const [rows, server] = await Promise.all([listEvents(id), listServerCanals(id)]);
      set({ rows, server: Object.fromEntries(server.map((s) => [s.result.canalId, s])) });
    },

    async record(type, data, opts) {
      const id = uid();
      const caseId = opts.caseId ?? get().caseId;
      if (id === null || !caseId) return null;
      // A double tap on one answer: the second arrives before the card has changed.
      if (repeats.repeats(JSON.stringify([caseId, opts.canalId, type, data]), performance.now())) return null;
      // A newer app on an older server: record nothing the server would not understand.
      if (!serverKnows(type, get().identity.serverContract)) {
        set({ error: 'Not saved: the server does not know this step yet. Ask your clinic to update Coneline.' });
        return null;
      }
      const raw = {
        id: newId(),
        caseId,
        ...(opts.canalId ? { canalId: opts.canalId } : {}),
        type,
        at: new Date().toISOString(),
        data,
      };
      const parsed = parseEvent(raw);
      if (!parsed.ok) {
        set({ error: `Not saved: ${parsed.error}` });
        return null;
      }
      const event = parsed.event;
      // The server would refuse it for good: say so now instead of keeping it in the outbox.
      const overLimit = limitRefusal(get().rows, event);
      if (overLimit) {
        set({ error: `Not saved: ${overLimit}` });
        return null;
      }
      try {
        const row = await putEvent(id, event);
        set((s) => ({
          rows: [...s.rows, row],
          error: null,
          saved: s.saved + 1,
          undo:
            type === 'event.voided'
              ? null
              : { key: ++undoKey, label: opts.label, eventId: event.id, canalId: opts.canalId },
          // An entry with no value to show big (a withdrawal, say) clears the panel: what it
          // showed may be the very answer just withdrawn.
          last: opts.value ? { eventId: event.id, canalId: opts.canalId, label: opts.label, value: opts.value } : null,
        }));
      } catch (e) {
        set({ error: `Not saved on this tablet: ${e instanceof Error ? e.message : String(e)}` });
        return null;
      }
      // Submitting a returned case again: it waits for review from now, not from the next pull.
      if (type === 'case.submitted' && get().reviews[caseId] === 'returned') {
        const reviews = { ...get().reviews, [caseId]: 'submitted' as const };
        set({ reviews });
        void setMeta([id, 'reviews'], reviews);
      }
      if (navigator.onLine) kickSoon();
      return event;
    },

    async undoLast() {
      const u = get().undo;
      if (!u) return;
      set({ undo: null });
      if (u.finishedCanal) {
        get().setFinished(u.finishedCanal, false);
        set({ undo: null });
        return;
      }
      if (!u.eventId) return;
      const target = get().rows.find((r) => r.event.id === u.eventId)?.event;
      if (!target) return;
      await get().record(
        'event.voided',
        { eventId: u.eventId, reason: 'Undone on the tablet' },
        {
          caseId: target.caseId,
          canalId: target.canalId,
          label: `Undone: ${u.label}`,
        },
      );
      if (get().last?.eventId === u.eventId) set({ last: null });
    },

    clearUndo: () => set({ undo: null }),

    openCase(caseId, canalId = null) {
      set({ caseId, canalId: canalId ?? get().landing?.[caseId!] ?? null, last: null, undo: null });
      remember();
    },

    selectCanal(canalId) {
      set({ canalId, last: null });
      remember();
    },

    setFinished(canalId, finished) {
      // From contract version 2 finishing compaction is an event: it syncs, shows on another
      // tablet and is judged there (compaction-incomplete). An older server keeps the mark here.
      const standing = get()
        .tablet.canals.find((c) => c.canalId === canalId)
        ?.reading.counted.findLast((e) => e.type === 'compaction.finished' && e.canalId === canalId);
      if (finished && !standing && serverKnows('compaction.finished', get().identity.serverContract)) {
        // The undo strip withdraws it as any recorded step; the "just entered" panel clears.
        set({ last: null });
        void get().record('compaction.finished', {}, { canalId, label: 'compaction finished' });
        return;
      }
      if (!finished && standing) {
        set({ last: null });
        void get().record(
          'event.voided',
          { eventId: standing.id, reason: 'Back to compaction' },
          { canalId, label: 'Back to compaction' },
        );
      }
      const marks = { finished: { ...get().marks.finished, [canalId]: finished } };
      set({
        marks,
        undo: finished ? { key: ++undoKey, label: 'compaction finished', finishedCanal: canalId } : get().undo,
        // The last cone's length is no longer the news once compaction is finished.
        last: finished ? null : get().last,
      });
      const id = uid();
      if (id !== null) void setMeta([id, 'marks'], marks);
    },

    setReplaceSpreader(canalId, on) {
      set({ replaceSpreader: { ...get().replaceSpreader, [canalId]: on } });
    },

    toggleUniversal: () => set({ showUniversal: !get().showUniversal }),

    async syncNow() {
      await loop?.kick(true);
    },

    async restoreCase(caseId) {
      const id = uid();
      if (id === null) return false;
      const answer = await fetchCase(caseId);
      if (answer.kind !== 'ok') {
        set({
          error:
            answer.kind === 'offline'
              ? 'No network: the case cannot be fetched now.'
              : `The server answered ${answer.status}.`,
        });
        return false;
      }
      await importSynced(id, answer.value.events);
      if (answer.value.canals.length) await putServerCanals(id, answer.value.canals);
      await get().reload();
      get().openCase(caseId);
      return true;
    },

    async dismiss(eventId) {
      const id = uid();
      if (id === null) return;
      await dismissRejected(id, eventId);
      await get().reload();
    },

    async unsentBeforeSignOut() {
      if (uid() === null) return 0;
      if (navigator.onLine) await loop?.kick(true);
      await get().reload();
      return get().rows.filter((r) => r.state === 'queued').length;
    },

    async leaveTablet() {
      const id = uid();
      if (id === null) return;
      loop?.stop();
      await leave(id, get().rows.filter((r) => r.state === 'queued').length);
    },
  };
});

// The open case is derived here, once per change of the log or of the case, for every
// component: each canal is read by the rules core only when its own inputs changed.
const memo = new CanalMemo();
useChairside.subscribe((s, prev) => {
  if (s.rows === prev.rows && s.caseId === prev.caseId) return;
  useChairside.setState({ tablet: deriveCase(s.rows, s.caseId, memo) });
  // A case just opened is pulled at once; otherwise the loop only re-checks whether it has work.
  if (s.caseId !== prev.caseId && s.caseId !== null) void loop?.kick(false);
  else loop?.poke();
});
