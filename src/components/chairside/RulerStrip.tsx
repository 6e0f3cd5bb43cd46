import { useState } from 'react';
import { rulerValues } from '../../lib/client/flow';
import { mmValue } from '../../lib/present/format';

const SPANS = [2, 5, 10, 20];

/** Lengths on the cards: one decimal, tabular figures (17 → "17.0"). */
export const mm = mmValue;

/**
 * The value a ruler is centred on, and what it is: a marked value means different things on
 * different cards (a textbook average at set-up, the CWL, the last spreader depth), so each
 * card names it. `word` fits under the number on the button; `meaning` is said in full.
 */
export interface RulerMark {
  mm: number;
  /** A word or two under the number, e.g. "CWL − 1" or "last depth". */
  word: string;
  /** What the mark is, e.g. "the CWL less 1 mm, where the spreader should reach". */
  meaning: string;
}

/** How one value reads where a length alone would mislead (the CEJ ruler: "1.0" and "below"). */
export interface RulerReading {
  big: string;
  small?: string;
  spoken: string;
}

/**
 * The ruler strip: one tap records a length. Buttons of 0.5 mm, at least 64 px square,
 * centred on a value the card marks and names; "Wider" shows more of the range.
 */
export function RulerStrip(props: {
  label: string;
  centre: number;
  mark?: RulerMark;
  selected?: number;
  onTap: (mm: number) => void;
  min?: number;
  max?: number;
  testId?: string;
  /** A fixed span (no "Wider" button), e.g. the small CEJ ruler. */
  span?: number;
  /** How each value reads, when millimetres alone would not say it (default: "17.0"). */
  read?: (mm: number) => RulerReading;
  /** Words after the label in place of "(mm)". */
  unit?: string;
}) {
  const [spanIndex, setSpanIndex] = useState(0);
  const span = props.span ?? SPANS[spanIndex] ?? 2;
  const values = rulerValues(props.centre, span, props.min ?? 0.5, props.max ?? 40);
  const canWiden = props.span === undefined && spanIndex < SPANS.length - 1;
  const { mark } = props;
  return (
    <div role="group" aria-label={props.label} data-testid={props.testId ?? 'ruler'} className="my-2">
      <p className="text-base font-bold mb-1">
        {props.label} <span className="font-normal text-muted">{props.unit ?? '(mm)'}</span>
        {mark && (
          <span className="font-normal text-muted" data-testid="ruler-mark">
            {' '}
            · marked: {mark.meaning}
          </span>
        )}
      </p>
      <div className="flex flex-wrap gap-2">
        {values.map((v) => {
          const isMarked = mark !== undefined && Math.abs(v - mark.mm) < 1e-9;
          const isSelected = props.selected !== undefined && Math.abs(v - props.selected) < 1e-9;
          const r = props.read?.(v) ?? { big: mm(v), spoken: `${mm(v)} millimetres` };
          const small = isMarked ? mark.word : r.small;
          return (
            <button
              key={v}
              type="button"
              data-mm={v}
              data-mark={isMarked ? mark.word : undefined}
              aria-pressed={props.selected !== undefined ? isSelected : undefined}
              aria-label={isMarked ? `${r.spoken}, ${mark.meaning}` : r.spoken}
              onClick={() => props.onTap(v)}
              className={`relative min-h-16 min-w-16 w-16 rounded-lg border-2 text-lg font-bold tabular flex flex-col items-center justify-center leading-tight ${
                isSelected
                  ? 'bg-ink text-white border-ink ring-4 ring-gutta'
                  : isMarked
                    ? 'bg-white border-gutta-strong border-4'
                    : 'bg-white border-ink'
              }`}
            >
              <span>{r.big}</span>
              {small && (
                <span
                  className={`text-xs font-bold text-center ${isSelected ? 'text-white' : isMarked ? 'text-gutta-strong' : 'text-muted'}`}
                  aria-hidden="true"
                >
                  {small}
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
