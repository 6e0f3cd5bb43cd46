import { lazy, useState } from 'react';
import type { CaseInfo, TabletCase } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { lockOf } from '../../lib/client/views';
import { CanalStepper } from './CanalStepper';
import { CanalTabs } from './CanalTabs';
import { Later } from './Later';
import { Guarded } from './useCardGuard';

// Set-up, finishing, discarding and the review lock come once per canal or case: loaded when
// first shown (see ChairsideApp).
const CanalPicker = lazy(() => import('./CanalPicker').then((m) => ({ default: m.CanalPicker })));
const CanalSetup = lazy(() => import('./CanalSetup').then((m) => ({ default: m.CanalSetup })));
const Summary = lazy(() => import('./Summary').then((m) => ({ default: m.Summary })));
const DiscardCase = lazy(() => import('./DiscardCase').then((m) => ({ default: m.DiscardCase })));
const ReviewLock = lazy(() => import('./ReviewLock').then((m) => ({ default: m.ReviewLock })));

/** One open case: canal tabs, and below them the canal stepper, the canal set-up or the finishing card. */
export function CaseView(props: { info: CaseInfo; tablet: TabletCase }) {
  const { info, tablet } = props;
  const { canals, events } = tablet;
  const canalId = useChairside((s) => s.canalId);
  const selectCanal = useChairside((s) => s.selectCanal);
  const serverContract = useChairside((s) => s.identity.serverContract);
  const review = useChairside((s) => s.reviews[info.caseId]);
  const lock = lockOf(tablet, review);
  const [view, setView] = useState<'canal' | 'add' | 'finish'>(canals.length === 0 ? 'add' : 'canal');
  const [queue, setQueue] = useState<string[]>([]);
  const [firstNew, setFirstNew] = useState<string | null>(null);

  const statuses = Object.fromEntries(canals.map((c) => [c.canalId, c.reading.result.state.status]));
  const selected = canals.find((c) => c.canalId === canalId) ?? canals[0] ?? null;
  const showAdd = view === 'add' || canals.length === 0;

  let body;
  if (lock !== null && view !== 'finish') {
    body = <ReviewLock tablet={tablet} lock={lock} />;
  } else if (showAdd && queue.length > 0) {
    body = (
      <CanalSetup
        key={queue[0]}
        name={queue[0]!}
        caseId={info.caseId}
        setting={info.setting}
        tooth={info.tooth}
        remaining={queue.length - 1}
        onCancel={() => {
          // Cancelling one canal keeps the others picked; cancelling the last leaves no empty case.
          const rest = queue.slice(1);
          setQueue(rest);
          if (rest.length > 0) return;
          const first = firstNew ?? canals[0]?.canalId ?? null;
          setFirstNew(null);
          if (first !== null) {
            selectCanal(first);
            setView('canal');
          } else {
            void import('./DiscardCase').then((m) => {
              if (m.canDiscard(tablet, serverContract)) {
                void m.discardOpenCase(info.caseId, 'Cancelled before any canal was set up');
              }
            });
          }
        }}
        onDone={(id) => {
          const rest = queue.slice(1);
          const first = firstNew ?? id;
          setQueue(rest);
          setFirstNew(rest.length ? first : null);
          if (rest.length === 0) {
            selectCanal(first);
            setView('canal');
          }
        }}
      />
    );
  } else if (showAdd) {
    body = (
      <CanalPicker
        tooth={info.setting === 'block' ? undefined : info.tooth}
        existing={canals.map((c) => c.name)}
        onPick={(names) => {
          setQueue(names);
          setFirstNew(null);
        }}
        onCancel={canals.length ? () => setView('canal') : undefined}
      />
    );
    body = (
      <>
        {body}
        <DiscardCase tablet={tablet} />
      </>
    );
  } else if (view === 'finish') {
    body = (
      <>
        <Summary info={info} tablet={tablet} locked={lock !== null} />
        <DiscardCase tablet={tablet} />
      </>
    );
  } else if (selected) {
    body = (
      <CanalStepper
        key={selected.canalId}
        canal={selected}
        setting={info.setting}
        caseId={info.caseId}
        events={events}
        onFinishTooth={() => setView('finish')}
      />
    );
  }

  return (
    <div className="-m-3">
      <CanalTabs
        canals={canals}
        statuses={statuses}
        selected={selected?.canalId ?? null}
        view={showAdd ? 'add' : view}
        onSelect={(id) => {
          selectCanal(id);
          setView('canal');
        }}
        onAdd={() => {
          setQueue([]);
          setView('add');
        }}
        onFinish={() => setView('finish')}
      />
      <div className="p-3">
        {/* A double tap that changed the screen must not land on what replaced it. */}
        <Guarded screen={`${lock ?? 'open'}|${showAdd ? 'add' : view}|${queue[0] ?? ''}|${selected?.canalId ?? ''}`}>
          <Later>{body}</Later>
        </Guarded>
      </div>
    </div>
  );
}
