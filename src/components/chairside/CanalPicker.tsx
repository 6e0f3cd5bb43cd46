import { useState } from 'react';
import { pickCanal, SINGLE_CANAL, usualCanals } from '../../lib/rules/core';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';

/** The canals to set up, proposed from the tooth's usual anatomy as toggles (editable). */
export function CanalPicker(props: {
  tooth?: number;
  existing: string[];
  onPick: (names: string[]) => void;
  onCancel?: () => void;
}) {
  const usual = props.tooth ? usualCanals(props.tooth) : { canals: [SINGLE_CANAL], optional: [] };
  const fresh = props.existing.length === 0;
  const [picked, setPicked] = useState<string[]>(fresh ? usual.canals : []);
  const [other, setOther] = useState('');
  const offered = Array.from(new Set([...usual.canals, ...usual.optional, ...picked])).filter(
    (n) => !props.existing.includes(n),
  );
  const toggle = (n: string) => setPicked(pickCanal(usual, picked, n));
  // A single-canal tooth that may have two: the pair replaces the single canal (pickCanal).
  const mayHaveTwo =
    fresh && usual.canals.length === 1 && usual.canals[0] === SINGLE_CANAL && usual.optional.length > 0;
  return (
    <StepCard
      title={fresh ? 'Which canals?' : 'Add a canal'}
      hint={
        mayHaveTwo
          ? "Proposed from the tooth's usual anatomy. Found two canals? Add B or L: the one canal becomes B and L."
          : "Proposed from the tooth's usual anatomy; change them to what you found."
      }
    >
      <ChipGroup label="Canals">
        {offered.map((n) => (
          <Chip key={n} selected={picked.includes(n)} onTap={() => toggle(n)} testId={`canal-${n}`}>
            {usual.optional.includes(n) ? `add ${n}` : n}
          </Chip>
        ))}
      </ChipGroup>
      <div className="flex flex-wrap gap-2 items-end mb-3">
        <label className="text-base font-bold">
          Another name
          <input
            value={other}
            maxLength={12}
            onChange={(e) => setOther(e.target.value)}
            className="block min-h-14 w-40 px-3 text-xl border-2 border-ink rounded-lg font-normal"
          />
        </label>
        <Answer
          disabled={other.trim() === ''}
          onTap={() => {
            const n = other.trim();
            if (n && !picked.includes(n)) setPicked([...picked, n]);
            setOther('');
          }}
        >
          Add
        </Answer>
      </div>
      <Answers>
        <Answer
          tone="primary"
          disabled={picked.length === 0}
          onTap={() => props.onPick(offered.filter((n) => picked.includes(n)))}
          testId="canals-confirm"
        >
          Set up {picked.length === 1 ? 'this canal' : `${picked.length} canals`}
        </Answer>
        {props.onCancel && <Answer onTap={props.onCancel}>Back</Answer>}
      </Answers>
    </StepCard>
  );
}
