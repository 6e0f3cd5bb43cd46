import { useState } from 'react';
import { floorToHalf, ISO_SIZES, stepBackSchedule } from '../../lib/rules/core';
import { mmValue } from '../../lib/present/format';
import { Chip, ChipGroup } from '../chairside/AnswerButtons';
import { IsoBadge, IsoChip } from '../shared/IsoChip';
import { LengthInput } from './LengthInput';
import { exact } from './Result';
import { Sources } from './Sources';

const STEPS = [1.0, 0.5] as const;
const COUNTS = [3, 4, 5] as const;

/** Step-back after the MAF: each larger file shorter by the step, the MAF used to recapitulate. */
export function StepBack() {
  const [maf, setMaf] = useState('25');
  const [cwl, setCwl] = useState(21);
  const [step, setStep] = useState<0.5 | 1.0>(1.0);
  const [count, setCount] = useState<number>(3);
  const schedule = stepBackSchedule(maf, cwl, step, count);
  return (
    <>
      <div className="overflow-x-auto">
        <table className="min-w-72 text-lg border-collapse bg-white" data-testid="step-back-result" aria-live="polite">
          <caption className="text-left text-lg font-bold mb-1">Step-back schedule</caption>
          <thead>
            <tr className="border-b-2 border-ink text-left">
              <th scope="col" className="py-2 pr-6">
                File
              </th>
              <th scope="col" className="py-2 pr-6">
                Length
              </th>
              <th scope="col" className="py-2 pr-6">
                Exact
              </th>
            </tr>
          </thead>
          <tbody>
            <tr className="border-b border-line">
              <td className="py-2 pr-6">
                <IsoBadge size={maf} /> MAF, to recapitulate
              </td>
              <td className="py-2 pr-6 text-2xl font-bold tabular">{mmValue(cwl)} mm</td>
              <td className="py-2 pr-6 tabular text-muted">the CWL</td>
            </tr>
            {schedule.map((s) => (
              <tr key={s.size} className="border-b border-line" data-size={s.size} data-mm={floorToHalf(s.lengthMm)}>
                <td className="py-2 pr-6">
                  <IsoBadge size={s.size} />
                </td>
                <td className="py-2 pr-6 text-2xl font-bold tabular">{mmValue(floorToHalf(s.lengthMm))} mm</td>
                <td className="py-2 pr-6 tabular text-muted">{exact(s.lengthMm)} mm</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {schedule.length < count && (
        <p className="text-base mt-1">
          {schedule.length === 0 ? 'No file follows' : 'Only these files follow'} this MAF within the ISO sizes and a
          length of 0.5 mm or more.
        </p>
      )}
      <fieldset className="mt-3 mb-3">
        <legend className="text-base font-bold mb-1">MAF size</legend>
        <div className="flex flex-wrap gap-2">
          {ISO_SIZES.map((size) => (
            <IsoChip
              key={size}
              size={size}
              selected={size === maf}
              onTap={() => setMaf(size)}
              testId={`step-back-maf-${size}`}
            />
          ))}
        </div>
      </fieldset>
      <LengthInput label="CWL" value={cwl} onChange={setCwl} testId="step-back-cwl" />
      <ChipGroup label="Shorter by, per size">
        {STEPS.map((s) => (
          <Chip key={s} selected={step === s} onTap={() => setStep(s)}>
            {mmValue(s)} mm
          </Chip>
        ))}
      </ChipGroup>
      <ChipGroup label="Files after the MAF">
        {COUNTS.map((c) => (
          <Chip key={c} selected={count === c} onTap={() => setCount(c)}>
            {c}
          </Chip>
        ))}
      </ChipGroup>
      <Sources id="step-back" />
    </>
  );
}
