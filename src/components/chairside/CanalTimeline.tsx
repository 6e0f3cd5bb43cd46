import { lazy, Suspense, useMemo, useState } from 'react';
import type { CanalInfo } from '../../lib/client/derive';

// The list and its words load when the timeline is first opened (docs/architecture.md, "Chairside budget").
const TimelineList = lazy(() => import('./TimelineList').then((m) => ({ default: m.TimelineList })));

/**
 * The canal's timeline. An answer is never edited: withdrawing it records `event.voided`,
 * and the stepper goes back to that card so it can be answered again.
 */
export function CanalTimeline({ canal }: { canal: CanalInfo }) {
  const { canalId, reading } = canal;
  const [open, setOpen] = useState(false);
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
        <Suspense fallback={<p className="text-base">Opening…</p>}>
          <TimelineList canalId={canalId} list={list} />
        </Suspense>
      )}
    </section>
  );
}
