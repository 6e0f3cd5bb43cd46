// "Recompute all canals": starts the background re-judging and shows how far it has come.
import { useEffect, useState } from 'react';
import type { RecomputeStatus } from '../../lib/settings-contract';
import { formatInstant, type Clinic } from '../../lib/present/format';
import { jsonWrite, requestId, send } from './requests';

interface Props {
  clinic: Clinic;
  /** Bumped by the form after a saved change, which starts a re-judging of its own. */
  watch: number;
}

const POLL_MS = 1000;

export function RecomputePanel({ clinic, watch }: Props) {
  const [status, setStatus] = useState<RecomputeStatus | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  // Each tick reads the progress once; a running re-judging schedules the next tick.
  const [tick, setTick] = useState(0);

  useEffect(() => {
    let cancelled = false;
    let timer: ReturnType<typeof setTimeout> | undefined;
    void send<RecomputeStatus>('/api/settings/recompute').then((reply) => {
      if (cancelled) return;
      if (!reply.ok) {
        setMessage(reply.error);
        return;
      }
      setStatus(reply.body);
      // While it runs, or a job towards the current versions has begun and not finished.
      const { running, startedAt, finishedAt } = reply.body;
      if (running || (startedAt !== null && finishedAt === null))
        timer = setTimeout(() => setTick((t) => t + 1), POLL_MS);
    });
    return () => {
      cancelled = true;
      if (timer) clearTimeout(timer);
    };
  }, [tick, watch]);

  async function start() {
    setBusy(true);
    setMessage(null);
    const reply = await send<RecomputeStatus>('/api/settings/recompute', jsonWrite('POST', { id: requestId() }));
    setBusy(false);
    if (!reply.ok) {
      setMessage(reply.error);
      return;
    }
    setStatus(reply.body);
    setTick((t) => t + 1);
  }

  const finished = status !== null && !status.running && status.finishedAt !== null;
  return (
    <section aria-labelledby="recompute-h" className="bg-white border border-line rounded-lg p-4 mt-6">
      <h2 id="recompute-h" className="text-xl font-bold mb-2">
        Judge the canals again
      </h2>
      <p className="mb-3">
        A saved change is applied to every canal of a case not signed off, in the background. Signed-off cases keep the
        verdict they were approved with. Use the button to judge every such canal again now.
      </p>
      <button
        type="button"
        onClick={() => void start()}
        disabled={busy}
        className="bg-ink text-white font-bold rounded px-4 py-3 text-lg min-h-12 disabled:opacity-60"
      >
        Recompute all canals
      </button>
      <div
        className="mt-4"
        data-testid="recompute-status"
        data-finished={finished ? 'true' : 'false'}
        data-started-at={status?.startedAt ?? ''}
      >
        {status && (
          <>
            <label htmlFor="recompute-progress" className="block font-bold">
              {status.done} of {status.total} canals judged with the settings in force (version {status.settingsVersion}
              )
            </label>
            <progress
              id="recompute-progress"
              className="w-full h-4"
              value={status.done}
              max={Math.max(status.total, 1)}
            />
            <p role="status" className="text-muted">
              {status.startedAt ? `Started ${formatInstant(status.startedAt, clinic)}. ` : ''}
              {finished
                ? `Finished ${formatInstant(status.finishedAt!, clinic)}.`
                : status.running || status.startedAt
                  ? 'Running…'
                  : 'Not started since the settings last changed.'}
            </p>
          </>
        )}
        {message && (
          <p role="alert" className="text-stop">
            {message}
          </p>
        )}
      </div>
    </section>
  );
}
