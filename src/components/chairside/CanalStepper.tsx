import { lazy, Suspense, useEffect, useMemo } from 'react';
import type { LogEvent } from '../../lib/rules/core';
import type { CanalInfo, Setting } from '../../lib/client/derive';
import { nextCard, type Card } from '../../lib/client/flow';
import { useChairside } from '../../lib/client/store';
import { shownResult } from '../../lib/client/views';
import { canalTitle } from '../../lib/present/labels';
import { CanalDiagram } from '../shared/CanalDiagram';
import type { CardProps } from './cardTypes';
import { Later } from './Later';
import { useCardGuard } from './useCardGuard';
import { CanalTimeline } from './CanalTimeline';
import { FindingList, JustEntered } from './FindingList';
import { AccessoryCard, RemoveCard, SpreaderCard } from './StepCardsCompaction';
import { DryCard, MasterCard, RadiographCard, RinseCard, SealCard, SeatCard, TaperCard } from './StepCardsPrep';

// Correcting the CWL is rare: its panel loads with the first card (precached), in a box of
// the button's height so nothing below it moves when it arrives.
const CwlCorrection = lazy(() => import('./CwlCorrection').then((m) => ({ default: m.CwlCorrection })));
// The cards after compaction come once per canal, late in it: loaded when the first is shown.
const FinishCard = lazy(() => import('./StepCardsFinish').then((m) => ({ default: m.FinishCard })));
// Asking the attending to check the cone fit: on the cone-fit and sealing cards only.
const ConeFitPanel = lazy(() => import('./ConeFitPanel').then((m) => ({ default: m.ConeFitPanel })));

function renderCard(card: Card, p: CardProps, onFinishTooth: () => void, retake: boolean) {
  switch (card.kind) {
    case 'seat':
      return <SeatCard {...p} />;
    case 'taper':
      return <TaperCard {...p} centre={card.centre} />;
    case 'radiograph':
      return <RadiographCard {...p} purpose={card.purpose} retake={retake && card.purpose === 'cone-fit'} />;
    case 'rinse':
      return <RinseCard {...p} />;
    case 'dry':
      return <DryCard {...p} centre={card.centre} />;
    case 'master':
      return <MasterCard {...p} centre={card.centre} refit={card.refit} />;
    case 'seal':
      return <SealCard {...p} />;
    case 'spreader':
      return <SpreaderCard {...p} cycle={card.cycle} centre={card.centre} complete={card.complete} />;
    case 'accessory':
      return <AccessoryCard {...p} cycle={card.cycle} depthMm={card.depthMm} redo={card.redo} />;
    case 'remove':
      return <RemoveCard {...p} eventId={card.eventId} lengthMm={card.lengthMm} depthMm={card.depthMm} />;
    default:
      return (
        <Later>
          <FinishCard {...p} card={card} onFinishTooth={onFinishTooth} />
        </Later>
      );
  }
}

/** The selected canal: its current step card, the value just entered with its verdict, findings, diagram. */
export function CanalStepper(props: {
  canal: CanalInfo;
  setting: Setting;
  caseId: string;
  events: LogEvent[];
  onFinishTooth: () => void;
}) {
  const { setting, caseId, events } = props;
  const canalId = props.canal.canalId;
  const rows = useChairside((s) => s.rows);
  const server = useChairside((s) => s.server);
  const marked = useChairside((s) => s.marks.finished[canalId] ?? false);
  const replaceSpreader = useChairside((s) => s.replaceSpreader[canalId] ?? false);
  const last = useChairside((s) => s.last);
  const record = useChairside((s) => s.record);

  // The screen stays awake while a canal is open; the wake lock's code loads with the first canal.
  useEffect(() => {
    let release: (() => void) | null = null;
    let open = true;
    void import('../../lib/client/wakeLock').then((m) => {
      if (open) release = m.keepAwake();
    });
    return () => {
      open = false;
      release?.();
    };
  }, [canalId]);

  const canal = props.canal;
  // Recorded as an event from contract version 2; a mark kept on the tablet before that.
  const finished = marked || canal.reading.result.state.compactionFinished;
  const shown = useMemo(
    () => shownResult(rows, server, canal.reading.result, caseId, canalId),
    [rows, server, canal.reading, caseId, canalId],
  );
  const findings = shown.result?.findings ?? [];
  const state = shown.result?.state ?? null;
  const card = nextCard(canal.reading, {
    findingCodes: findings.map((f) => f.code),
    compactionFinished: finished,
    replaceSpreader,
  });
  const cardProps: CardProps = {
    canal,
    setting,
    state,
    rec: async (type, data, label, value) => {
      await record(type, data, { canalId: canal.canalId, label, value });
    },
  };
  const lastHere = last && last.canalId === canal.canalId ? last : null;
  const verdict = lastHere ? findings.filter((f) => f.eventId === lastHere.eventId) : [];
  const cardKey = `${card.kind}-${events.length}`;
  const guard = useCardGuard(cardKey);

  return (
    // The diagram stays beside the card, upright too (a narrower column), so the answers and the
    // diagram are both on screen without scrolling; below it only on a narrow phone.
    <div
      className="grid gap-3 grid-cols-1 sm:grid-cols-[minmax(0,1fr)_16rem] landscape:grid-cols-[minmax(0,1fr)_340px] items-start"
      onClickCapture={guard.onClickCapture}
    >
      <div data-testid="step" data-card={card.kind} data-armed={guard.armed}>
        <div key={cardKey}>
          {renderCard(
            card,
            cardProps,
            props.onFinishTooth,
            findings.some((f) => f.code === 'cone-fit-retake-needed'),
          )}
          {(card.kind === 'seal' || (card.kind === 'radiograph' && card.purpose === 'cone-fit')) && (
            <Suspense fallback={null}>
              <ConeFitPanel canal={canal} caseId={caseId} seal={card.kind === 'seal'} />
            </Suspense>
          )}
        </div>
        {lastHere && (
          <JustEntered key={lastHere.eventId} label={lastHere.label} value={lastHere.value} findings={verdict} />
        )}
        <FindingList findings={findings} source={shown.source} />
        <Suspense fallback={<div className="mt-4 min-h-14" />}>
          <CwlCorrection canalId={canal.canalId} cwlMm={canal.cwlMm} />
        </Suspense>
        <CanalTimeline canal={canal} />
      </div>
      <aside
        aria-label={`Diagram of the ${canalTitle(canal.name)}`}
        className="bg-white rounded-2xl border border-line p-2 landscape:p-3"
      >
        {state ? <CanalDiagram state={state} /> : <p className="text-muted">No diagram yet.</p>}
      </aside>
    </div>
  );
}
