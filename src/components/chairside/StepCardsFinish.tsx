import { useState } from 'react';
import { cejLevel } from '../../lib/present/format';
import { canalTitle } from '../../lib/present/labels';
import { useChairside } from '../../lib/client/store';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';
import type { Card } from '../../lib/client/flow';
import type { CardProps } from './cardTypes';

/** The steps after compaction. */
export type FinishStep = Extract<Card, { kind: 'fill' | 'sear' | 'compact' | 'clean' | 'done' }>;

const LENGTHS = [
  ['flush', 'Flush'],
  ['short-0-2', '0–2 mm short'],
  ['short-over-2', 'Over 2 mm short'],
  ['beyond', 'Beyond the apex'],
] as const;
type FillLength = (typeof LENGTHS)[number][0];

export function FillCard(props: CardProps & { radiographTaken: boolean; needsRadiograph: boolean }) {
  const { canal, rec, radiographTaken, needsRadiograph } = props;
  const setFinished = useChairside((s) => s.setFinished);
  const [length, setLength] = useState<FillLength | undefined>();
  const [voids, setVoids] = useState<boolean | undefined>();
  const assess = (l: FillLength | undefined, v: boolean | undefined) => {
    setLength(l);
    setVoids(v);
    if (l !== undefined && v !== undefined) {
      const label = LENGTHS.find(([k]) => k === l)?.[1] ?? l;
      void rec('fill.assessed', { length: l, voids: v }, 'fill check', `${label}${v ? ', voids' : ''}`);
    }
  };
  return (
    <StepCard
      title={
        needsRadiograph ? 'Fill check: radiograph, and what does it show?' : 'Fill check: what does the fill show?'
      }
      hint="Before cutting: the cones can still come out and the fill be redone."
    >
      {needsRadiograph && (
        <Answers>
          <Answer
            tone={radiographTaken ? 'plain' : 'primary'}
            disabled={radiographTaken}
            onTap={() => rec('radiograph.taken', { purpose: 'fill-check' }, 'fill-check radiograph', 'Taken')}
          >
            {radiographTaken ? '✓ Radiograph taken' : 'Radiograph taken'}
          </Answer>
        </Answers>
      )}
      <div className="mt-3" />
      <ChipGroup label="Length of the fill">
        {LENGTHS.map(([k, l]) => (
          <Chip key={k} selected={length === k} onTap={() => assess(k, voids)}>
            {l}
          </Chip>
        ))}
      </ChipGroup>
      <ChipGroup label="Voids">
        <Chip selected={voids === false} onTap={() => assess(length, false)}>
          None
        </Chip>
        <Chip selected={voids === true} onTap={() => assess(length, true)}>
          Seen
        </Chip>
      </ChipGroup>
      {!radiographTaken && (
        <Answers>
          <Answer onTap={() => setFinished(canal.canalId, false)}>Back to compaction</Answer>
        </Answers>
      )}
    </StepCard>
  );
}

/** A CEJ level on the ruler: the distance big, and below, above or at the CEJ under it. */
const readCej = (v: number) => ({
  big: v === 0 ? '0' : mm(Math.abs(v)),
  small: v === 0 ? 'at CEJ' : v > 0 ? 'below' : 'above',
  spoken: cejLevel(v),
});

export function SearCard({ rec, setting }: CardProps) {
  const [cej, setCej] = useState<number | undefined>();
  const tooth = setting !== 'block';
  const sear = (atOrifice: boolean) => {
    const data = { atOrifice, ...(tooth && cej !== undefined ? { relativeToCejMm: cej } : {}) };
    const where = atOrifice ? 'At the orifice' : 'Elsewhere';
    void rec('gp.seared', data, 'sear-off', cej !== undefined ? `${where}, ${cejLevel(cej)}` : where);
  };
  return (
    <StepCard
      title="Where did you sear off the gutta-percha?"
      hint={tooth ? 'Optional: how far below or above the CEJ you seared, then where.' : undefined}
    >
      {tooth && (
        <RulerStrip
          label="Sear level"
          unit="(mm from the CEJ)"
          centre={0.5}
          span={2.5}
          min={-2}
          max={3}
          selected={cej}
          read={readCej}
          onTap={(v) => setCej(cej === v ? undefined : v)}
          testId="ruler-cej"
        />
      )}
      <Answers>
        <Answer tone="primary" onTap={() => sear(true)}>
          At the orifice
        </Answer>
        <Answer onTap={() => sear(false)}>Elsewhere</Answer>
      </Answers>
    </StepCard>
  );
}

export function CompactCard({ rec }: CardProps) {
  return (
    <StepCard title="Compact the warm gutta-percha vertically" hint="With the plugger, at the sear level.">
      <Answers>
        <Answer tone="primary" onTap={() => rec('gp.compacted', {}, 'vertical compaction', 'Done')}>
          Done
        </Answer>
      </Answers>
    </StepCard>
  );
}

export function CleanCard({ rec }: CardProps) {
  const [agent, setAgent] = useState('alcohol');
  return (
    <StepCard title="Clean the sealer from the chamber" hint="Before the access is restored.">
      <ChipGroup label="Cleaned with">
        <Chip selected={agent === 'alcohol'} onTap={() => setAgent('alcohol')}>
          Alcohol
        </Chip>
        <Chip selected={agent === 'other'} onTap={() => setAgent('other')}>
          Other
        </Chip>
      </ChipGroup>
      <Answers>
        <Answer tone="primary" onTap={() => rec('chamber.cleaned', { agent }, 'chamber cleaned', 'Done')}>
          Done
        </Answer>
      </Answers>
    </StepCard>
  );
}

export function DoneCard({ canal, onFinishTooth }: CardProps & { onFinishTooth: () => void }) {
  return (
    <StepCard
      title={`${canalTitle(canal.name)} is filled`}
      hint="Fill the other canals, then finish the tooth and submit it for review."
    >
      <Answers>
        <Answer tone="primary" onTap={onFinishTooth}>
          Finish the tooth
        </Answer>
      </Answers>
    </StepCard>
  );
}

/** The cards after compaction, one per step: loaded when the first of them is shown (CanalStepper). */
export function FinishCard(props: CardProps & { card: FinishStep; onFinishTooth: () => void }) {
  const { card } = props;
  switch (card.kind) {
    case 'fill':
      return <FillCard {...props} radiographTaken={card.radiographTaken} needsRadiograph={card.needsRadiograph} />;
    case 'sear':
      return <SearCard {...props} />;
    case 'compact':
      return <CompactCard {...props} />;
    case 'clean':
      return <CleanCard {...props} />;
    case 'done':
      return <DoneCard {...props} />;
  }
}
