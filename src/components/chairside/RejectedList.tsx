import { useMemo } from 'react';
import { useChairside } from '../../lib/client/store';
import { rejectedIn } from '../../lib/client/views';
import { describeEvent } from '../../lib/present/events';
import { DEFAULT_CLINIC, formatInstant } from '../../lib/present/format';

/** Events the server did not accept stay visible with its reason until the student dismisses them. */
export function RejectedList({ caseId }: { caseId: string | null }) {
  const rows = useChairside((s) => s.rows);
  const dismiss = useChairside((s) => s.dismiss);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  const rejected = useMemo(() => rejectedIn(rows, caseId), [rows, caseId]);
  if (rejected.length === 0) return null;
  return (
    <section
      aria-labelledby="rejected-title"
      className="m-3 p-3 bg-white border-2 border-stop rounded-xl"
      data-testid="rejected"
    >
      <h2 id="rejected-title" className="text-lg font-bold text-stop">
        Not accepted by the server
      </h2>
      <ul className="flex flex-col gap-2 mt-2">
        {rejected.map((r) => (
          <li key={r.event.id} className="flex flex-wrap items-center gap-3">
            <span className="text-base">
              <span className="font-bold">{describeEvent(r.event)}</span> at {formatInstant(r.event.at, clinic, 'time')}
              : {r.error}
            </span>
            <button
              type="button"
              onClick={() => void dismiss(r.event.id)}
              className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-ink bg-white font-bold"
            >
              Dismiss
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}
