import { useState } from 'react';
import { rulerValues } from '../../lib/client/flow';
import { mmValue } from '../../lib/present/format';

const SPANS = [2, 5, 10, 20];

/** Lengths on the cards: one decimal, tabular figures (17 → "17.0"). */
export const mm = mmValue;

/**
 * The ruler strip: one tap records a length. Buttons of 0.5 mm, at least 64 px square,
 * centred on the value the step expects (marked); "Wider" shows more of the range.
 */
export function RulerStrip(props: {
  label: string;
  centre: number;
  expected?: number;
  selected?: number;
  onTap: (mm: number) => void;
  min?: number;
  max?: number;
  testId?: string;
  /** A fixed span (no "Wider" button), e.g. the small CEJ ruler. */
  span?: number;
}) {
  const [spanIndex, setSpanIndex] = useState(0);
  const span = props.span ?? SPANS[spanIndex] ?? 2;
  const values = rulerValues(props.centre, span, props.min ?? 0.5, props.max ?? 40);
  const canWiden = props.span === undefined && spanIndex < SPANS.length - 1;
  return (
    <div role="group" aria-label={props.label} data-testid={props.testId ?? 'ruler'} className="my-3">
      <p className="text-base font-bold mb-1">
        {props.label} <span className="font-normal text-muted">(mm)</span>
      </p>
      <div className="flex flex-wrap gap-2">
        {values.map((v) => {
          const isExpected = props.expected !== undefined && Math.abs(v - props.expected) < 1e-9;
          const isSelected = props.selected !== undefined && Math.abs(v - props.selected) < 1e-9;
          return (
            <button
              key={v}
              type="button"
              data-mm={v}
              aria-pressed={props.selected !== undefined ? isSelected : undefined}
              aria-label={`${mm(v)} millimetres${isExpected ? ', expected' : ''}`}
              onClick={() => props.onTap(v)}
              className={`relative min-h-16 min-w-16 w-16 rounded-lg border-2 text-lg font-bold tabular flex flex-col items-center justify-center ${
                isSelected
                  ? 'bg-ink text-white border-ink ring-4 ring-gutta'
                  : isExpected
                    ? 'bg-white border-gutta-strong border-4'
                    : 'bg-white border-ink'
              }`}
            >
              <span>{mm(v)}</span>
              {isExpected && (
                <span
                  className={`text-xs font-bold ${isSelected ? 'text-white' : 'text-gutta-strong'}`}
                  aria-hidden="true"
                >
                  expected
                </span>
              )}
            </button>
          );
        })}
        {canWiden && (
          <button
            type="button"
            onClick={() => setSpanIndex(spanIndex + 1)}
            className="min-h-16 min-w-16 px-3 rounded-lg border-2 border-dashed border-ink bg-paper text-base font-bold"
          >
            Wider
          </button>
        )}
      </div>
    </div>
  );
}
