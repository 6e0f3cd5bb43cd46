import type { LogEvent } from '../../lib/rules/core';
import { describeEvent } from '../../lib/present/events';
import { DEFAULT_CLINIC, formatInstant } from '../../lib/present/format';
import { useChairside } from '../../lib/client/store';

/** The canal's events that count, each with its time and a way to withdraw it (not the set-up). */
export function TimelineList({ canalId, list }: { canalId: string; list: LogEvent[] }) {
  const record = useChairside((s) => s.record);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  return (
    <ol className="mt-2 flex flex-col gap-2" data-testid="timeline">
      {list.map((e) => (
        <li key={e.id} className="flex flex-wrap items-center gap-3 bg-white border border-line rounded-lg px-3 py-1">
          <span className="text-sm text-muted tabular">{formatInstant(e.at, clinic, 'time')}</span>
          <span className="text-base flex-1">{describeEvent(e)}</span>
          {e.type !== 'canal.added' && (
            <button
              type="button"
              onClick={() =>
                void record(
                  'event.voided',
                  { eventId: e.id, reason: 'Withdrawn from the timeline' },
                  { canalId, label: `withdrawn: ${describeEvent(e)}` },
                )
              }
              className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-stop text-stop bg-white font-bold"
            >
              Withdraw
            </button>
          )}
        </li>
      ))}
    </ol>
  );
}
