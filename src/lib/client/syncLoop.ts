import { backoffMs, syncOnce, type SyncOutcome } from './sync';

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
  onStatus: (s: SyncStatus) => void;
  /** Called after each attempt so the island reloads its events and server verdicts. */
  onOutcome: (o: SyncOutcome) => void;
  intervalMs?: number;
  run?: typeof syncOnce;
}

/**
 * Runs the sync automatically: when the browser comes online, every `intervalMs`, after a
 * tap (`kick`), and on "Sync now" (`kick(true)`, which ignores the back-off).
 * Only one attempt runs at a time; a kick during an attempt runs one more after it.
 */
export class SyncLoop {
  private timer: ReturnType<typeof setInterval> | null = null;
  private running = false;
  private again = false;
  private failures = 0;
  private nextAt = 0;
  private status: SyncStatus = { phase: 'idle' };
  private readonly onOnline = () => {
    void this.kick(true);
  };

  constructor(private readonly opts: SyncLoopOptions) {}

  start(): void {
    if (this.timer) return;
    window.addEventListener('online', this.onOnline);
    this.timer = setInterval(() => {
      void this.kick(false);
    }, this.opts.intervalMs ?? 15_000);
    void this.kick(true);
  }

  stop(): void {
    window.removeEventListener('online', this.onOnline);
    if (this.timer) clearInterval(this.timer);
    this.timer = null;
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
    if (userId === null) return;
    if (typeof navigator !== 'undefined' && navigator.onLine === false) {
      this.set({ phase: 'offline' });
      return;
    }
    if (!manual && Date.now() < this.nextAt) return;
    if (manual) this.failures = 0;
    this.running = true;
    this.set({ phase: 'syncing', error: undefined });
    let outcome: SyncOutcome;
    try {
      outcome = await (this.opts.run ?? syncOnce)(userId, this.opts.deviceId);
    } catch (e) {
      outcome = { kind: 'error', status: 0, error: e instanceof Error ? e.message : String(e) };
    }
    this.running = false;
    this.settle(outcome);
    this.opts.onOutcome(outcome);
    if (this.again) {
      this.again = false;
      void this.kick(false);
    }
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
