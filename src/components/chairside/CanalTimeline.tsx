import { useMemo, useState } from 'react';
import type { CanalInfo } from '../../lib/client/derive';
import { describeEvent } from '../../lib/present/events';
import { DEFAULT_CLINIC, formatInstant } from '../../lib/present/format';
import { useChairside } from '../../lib/client/store';

/**
 * The canal's timeline. An answer is never edited: withdrawing it records `event.voided`,
 * and the stepper goes back to that card so it can be answered again.
 */
export function CanalTimeline({ canal }: { canal: CanalInfo }) {
  const { canalId, reading } = canal;
  const [open, setOpen] = useState(false);
  const record = useChairside((s) => s.record);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  // The events that count, as the rules core read them: the canal's own, without case-level ones.
  const list = useMemo(() => reading.counted.filter((e) => e.canalId === canalId), [reading, canalId]);
  return (
    <section aria-label="Timeline" className="mt-4">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => setOpen(!open)}
        className="min-h-14 min-w-14 px-4 rounded-lg border-2 border-ink bg-white text-lg font-bold"
      >
        {open ? 'Hide timeline' : `Timeline (${list.length})`}
      </button>
      {open && (
        <ol className="mt-2 flex flex-col gap-2" data-testid="timeline">
          {list.map((e) => (
            <li
              key={e.id}
              className="flex flex-wrap items-center gap-3 bg-white border border-line rounded-lg px-3 py-1"
            >
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
      )}
    </section>
  );
}
