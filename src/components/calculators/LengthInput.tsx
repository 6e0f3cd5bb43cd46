import { useState } from 'react';
import { roundToHalf } from '../../lib/rules/core';
import { RulerStrip } from '../chairside/RulerStrip';
import { Keypad } from './Keypad';

/**
 * One length: the chairside's ruler strip (0.5 mm steps, "Wider" for more) or, for a value
 * read off a radiograph to 0.1 mm, a large keypad. The strip stays put while you tap it; a
 * typed length moves it to centre on the typed value.
 */
export function LengthInput(props: {
  label: string;
  value: number;
  onChange: (mm: number) => void;
  min?: number;
  max?: number;
  testId: string;
}) {
  const min = props.min ?? 0.5;
  const max = props.max ?? 40;
  const [centre, setCentre] = useState(props.value);
  const [typing, setTyping] = useState(false);
  const onRuler = Math.abs(props.value * 2 - Math.round(props.value * 2)) < 1e-9;
  return (
    <div data-testid={props.testId} className="border-t border-line pt-2">
      {typing ? (
        <Keypad
          label={props.label}
          min={min}
          max={max}
          testId={`${props.testId}-keypad`}
          onCancel={() => setTyping(false)}
          onUse={(mm) => {
            props.onChange(mm);
            setCentre(Math.min(max, Math.max(min, roundToHalf(mm))));
            setTyping(false);
          }}
        />
      ) : (
        <>
          <RulerStrip
            label={props.label}
            centre={centre}
            selected={props.value}
            min={min}
            max={max}
            testId={`${props.testId}-ruler`}
            onTap={props.onChange}
          />
          <div className="flex flex-wrap items-center gap-3 mb-2">
            <button
              type="button"
              onClick={() => setTyping(true)}
              className="min-h-14 min-w-14 px-4 rounded-lg border-2 border-edge bg-white text-lg font-bold"
            >
              Type it<span className="sr-only"> ({props.label})</span>
            </button>
            {!onRuler && (
              <p className="text-lg">
                Typed: <strong className="tabular">{props.value.toFixed(1)} mm</strong>
              </p>
            )}
          </div>
        </>
      )}
    </div>
  );
}
