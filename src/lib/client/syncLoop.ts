import { backoffMs, pullCase, syncOnce, type PullOutcome, type SyncOutcome } from './sync';

export type SyncPhase = 'idle' | 'syncing' | 'offline' | 'signed-out' | 'other-user' | 'error';

export interface SyncStatus {
  phase: SyncPhase;
  lastSyncedAt?: string;
  error?: string;
  nextAttemptAt?: number;
}

export interface SyncLoopOptions {
  deviceId: string;
  /** The outbox owner right now (the user the island works as), or null. */
  userId: () => number | null;
  /** Events waiting in the outbox, as the island holds them in memory (asking reads no IndexedDB). */
  pending: () => number;
  /** The open case whose news to pull (one the server knows), or null. */
  pullCaseId: () => string | null;
  onStatus: (s: SyncStatus) => void;
  /** Called after each push so the island reloads its events and server verdicts. */
  onOutcome: (o: SyncOutcome) => void;
  /** Called after each pull of the open case. */
  onPulled?: (caseId: string, o: PullOutcome) => void;
  /** How long to wait before sending again while events stay queued (answered "retry"). */
  retryMs?: number;
  /** How long to wait between pulls of the open case. */
  pullEveryMs?: () => number;
  run?: typeof syncOnce;
  pull?: (userId: number, caseId: string, etag: string | null) => Promise<PullOutcome>;
}

/** 30–60 s between pulls, spread so that a room of tablets does not ask in step. */
export function pullDelayMs(random = Math.random): number {
  return 30_000 + Math.round(30_000 * random());
}

/**
 * Runs the sync: when the browser comes online, after a tap (`kick`), on "Sync now"
 * (`kick(true)`, which ignores the back-off), again after `retryMs` while anything is queued,
 * and every 30–60 s while a case is open, when it pulls that case's news with one conditional
 * GET. With nothing queued and no case open it holds no timer and does nothing.
 * Only one attempt runs at a time; a kick during an attempt runs one more after it.
 */
export class SyncLoop {
  private timer: ReturnType<typeof setTimeout> | null = null;
  private started = false;
  private running = false;
  private again = false;
  private failures = 0;
  private nextAt = 0;
  private readonly etags = new Map<string, string>();
  private status: SyncStatus = { phase: 'idle' };
  private readonly onOnline = () => {
    void this.kick(true);
  };

  constructor(private readonly opts: SyncLoopOptions) {}

  start(): void {
    if (this.started) return;
    this.started = true;
    window.addEventListener('online', this.onOnline);
    void this.kick(false);
  }

  stop(): void {
    this.started = false;
    window.removeEventListener('online', this.onOnline);
    this.clearTimer();
  }

  /** The island's log or open case changed: arm a timer if there is now work, drop it if none. */
  poke(): void {
    if (!this.started || this.running) return;
    if (!this.hasWork()) this.clearTimer();
    else if (!this.timer) this.schedule();
  }

  private hasWork(): boolean {
    return this.opts.userId() !== null && (this.opts.pending() > 0 || this.opts.pullCaseId() !== null);
  }

  private clearTimer(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }

  private schedule(): void {
    this.clearTimer();
    if (!this.started || !this.hasWork()) return;
    // Offline, the `online` event kicks the loop: no timer meanwhile.
    if (typeof navigator !== 'undefined' && navigator.onLine === false) return;
    const wait = this.opts.pending() > 0 ? (this.opts.retryMs ?? 15_000) : (this.opts.pullEveryMs ?? pullDelayMs)();
    const delay = Math.max(wait, this.nextAt - Date.now());
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.kick(false);
    }, delay);
  }

  private set(s: Partial<SyncStatus>): void {
    this.status = { ...this.status, ...s };
    this.opts.onStatus(this.status);
  }

  async kick(manual = false): Promise<void> {
    if (this.running) {
      this.again = true;
      return;
    }
    const userId = this.opts.userId();
    if (userId === null) return this.clearTimer();
    if (typeof navigator !== 'undefined' && navigator.onLine === false) {
      this.set({ phase: 'offline' });
      return this.clearTimer();
    }
    if (!manual && Date.now() < this.nextAt) return this.schedule();
    if (manual) this.failures = 0;
    const push = manual || this.opts.pending() > 0;
    const caseId = this.opts.pullCaseId();
    if (!push && caseId === null) return this.clearTimer();
    this.clearTimer();
    this.running = true;
    let pushed: SyncOutcome | null = null;
    if (push) {
      this.set({ phase: 'syncing', error: undefined });
      try {
        pushed = await (this.opts.run ?? syncOnce)(userId, this.opts.deviceId);
      } catch (e) {
        pushed = { kind: 'error', status: 0, error: e instanceof Error ? e.message : String(e) };
      }
      this.settle(pushed);
      this.opts.onOutcome(pushed);
    }
    if (caseId !== null && (pushed === null || pushed.kind === 'done')) await this.pull(userId, caseId);
    this.running = false;
    if (this.again) {
      this.again = false;
      void this.kick(false);
    } else this.schedule();
  }

  private async pull(userId: number, caseId: string): Promise<void> {
    let o: PullOutcome;
    try {
      o = await (this.opts.pull ?? pullCase)(userId, caseId, this.etags.get(caseId) ?? null);
    } catch {
      o = { kind: 'error', status: 0 };
    }
    if (o.kind === 'changed') {
      if (o.etag) this.etags.set(caseId, o.etag);
      else this.etags.delete(caseId);
    }
    // A lost session or network shows as for a push; other failures wait for the next pull.
    if (o.kind === 'offline' || o.kind === 'signed-out') {
      this.settle(o);
      this.opts.onOutcome(o);
    }
    this.opts.onPulled?.(caseId, o);
  }

  private settle(o: SyncOutcome): void {
    if (o.kind === 'done') {
      this.failures = 0;
      this.nextAt = 0;
      this.set({ phase: 'idle', lastSyncedAt: new Date().toISOString(), nextAttemptAt: undefined });
      return;
    }
    this.failures++;
    this.nextAt = Date.now() + backoffMs(this.failures);
    const phase: SyncPhase = o.kind === 'offline' ? 'offline' : o.kind;
    const error = o.kind === 'error' ? (o.error ?? `The server answered ${o.status}`) : undefined;
    this.set({ phase, error, nextAttemptAt: this.nextAt });
  }
}
