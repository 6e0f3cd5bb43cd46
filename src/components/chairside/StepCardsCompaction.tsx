import { useState } from 'react';
import { useChairside } from '../../lib/client/store';
import { IsoChip } from '../shared/IsoChip';
import { Answer, Answers, ChipGroup, StepCard } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';
import { CONE_DESIGNATIONS, type CardProps } from './cardTypes';

export function SpreaderCard(props: CardProps & { cycle: number; centre: number; complete: boolean }) {
  const { canal, rec, cycle, centre, complete } = props;
  const setFinished = useChairside((s) => s.setFinished);
  const setReplace = useChairside((s) => s.setReplaceSpreader);
  const spreader = canal.spreader ?? 'MF';
  const hint =
    cycle === 1
      ? `Spreader ${spreader} beside the master cone; aim for within 2 mm of the CWL (${mm(canal.cwlMm)} mm).`
      : `Spreader ${spreader}; the ruler is centred on the last depth.`;
  return (
    <StepCard title={`Cycle ${cycle}: how deep does the spreader go?`} hint={hint}>
      {complete && (
        <p className="text-lg font-bold border-l-4 border-gutta-strong pl-3 my-2" data-testid="compaction-complete">
          The spreader no longer passes the coronal third: you can finish compaction, or go on.
        </p>
      )}
      <RulerStrip
        label="Spreader depth"
        centre={centre}
        mark={
          cycle === 1
            ? { mm: centre, word: 'CWL − 2', meaning: 'the CWL less 2 mm' }
            : { mm: centre, word: 'last depth', meaning: 'the last spreader depth' }
        }
        onTap={(v) => {
          setReplace(canal.canalId, false);
          void rec('spreader.placed', { spreader, depthMm: v }, `spreader, cycle ${cycle}`, `${mm(v)} mm`);
        }}
      />
      {cycle > 1 && (
        <Answers>
          <Answer tone={complete ? 'primary' : 'plain'} onTap={() => setFinished(canal.canalId, true)}>
            Finish compaction
          </Answer>
        </Answers>
      )}
    </StepCard>
  );
}

export function AccessoryCard(props: CardProps & { cycle: number; depthMm: number; redo: boolean }) {
  const { canal, rec, cycle, depthMm, redo } = props;
  const setReplace = useChairside((s) => s.setReplaceSpreader);
  const [size, setSize] = useState(canal.accessorySize ?? canal.spreader ?? 'MF');
  const [length, setLength] = useState(depthMm);
  const sizes = Array.from(new Set([...CONE_DESIGNATIONS, size, '20', '25']));
  const place = (reachedLength: boolean) =>
    rec(
      'accessory.placed',
      { size, lengthMm: length, reachedLength },
      `accessory cone ${size}, cycle ${cycle}${reachedLength ? '' : ' (short)'}`,
      `${mm(length)} mm`,
    );
  return (
    <StepCard
      title={
        redo
          ? `Place another cone at ${mm(depthMm)} mm: did it reach?`
          : `Accessory cone measured to ${mm(depthMm)} mm: did it reach?`
      }
      hint="Coat it with sealer and place it the moment the spreader comes out."
    >
      <ChipGroup label="Cone size">
        {sizes.map((s) => (
          <IsoChip key={s} size={s} selected={size === s} onTap={() => setSize(s)} />
        ))}
      </ChipGroup>
      <RulerStrip
        label="Cone measured to"
        centre={depthMm}
        mark={{ mm: depthMm, word: 'spreader', meaning: 'the spreader depth' }}
        selected={length}
        onTap={setLength}
        testId="ruler-accessory"
      />
      <Answers>
        <Answer tone="primary" onTap={() => place(true)} testId="reached">
          Reached
        </Answer>
        <Answer tone="warn" onTap={() => place(false)} testId="stopped-short">
          Stopped short
        </Answer>
        {redo && <Answer onTap={() => setReplace(canal.canalId, true)}>Re-place the spreader</Answer>}
      </Answers>
    </StepCard>
  );
}

export function RemoveCard(props: CardProps & { eventId: string; lengthMm: number; depthMm: number }) {
  const { rec, eventId, depthMm } = props;
  return (
    <StepCard
      title="The cone stopped short: remove it"
      hint={`A cone short of the spreader depth (${mm(depthMm)} mm) leaves a void. Remove it, then place another.`}
    >
      <Answers>
        <Answer
          tone="primary"
          testId="removed"
          onTap={() =>
            rec(
              'accessory.removed',
              { eventId, reason: 'Stopped short of the spreader depth' },
              'short cone removed',
              'Removed',
            )
          }
        >
          Removed
        </Answer>
      </Answers>
    </StepCard>
  );
}
