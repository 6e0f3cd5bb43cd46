import { useState } from 'react';

/** What a length typed on the keypad may look like: up to two digits, then one decimal. */
const TYPED = /^\d{0,2}(\.\d?)?$/;

/** The typed text as millimetres, or null when it is not a length within [min, max]. */
export function typedLength(text: string, min: number, max: number): number | null {
  if (!/^\d{1,2}(\.\d)?$/.test(text)) return null;
  const v = Number(text);
  return v >= min && v <= max ? v : null;
}

const KEY =
  'min-h-16 min-w-16 rounded-lg border-2 border-ink bg-white text-2xl font-bold tabular active:translate-y-px';

/**
 * A numeric keypad of 64 px keys for a length to 0.1 mm (a measurement read off a radiograph),
 * for gloved fingers: no system keyboard, no tiny input. `onUse` gets the length.
 */
export function Keypad(props: {
  label: string;
  min: number;
  max: number;
  onUse: (mm: number) => void;
  onCancel: () => void;
  testId?: string;
}) {
  const [text, setText] = useState('');
  const value = typedLength(text, props.min, props.max);
  const press = (key: string) => {
    const next = text + key;
    if (TYPED.test(next)) setText(next === '.' ? '0.' : next);
  };
  return (
    <div role="group" aria-label={`${props.label}, keypad`} data-testid={props.testId ?? 'keypad'} className="my-3">
      <p className="text-base font-bold mb-1">
        {props.label} <span className="font-normal text-muted">(mm)</span>
      </p>
      <output
        aria-live="polite"
        className="block min-h-16 max-w-60 mb-2 px-3 rounded-lg border-2 border-edge bg-paper text-4xl font-bold tabular leading-[3.75rem]"
        data-testid="keypad-display"
      >
        {text === '' ? <span className="text-muted text-2xl">type a length</span> : `${text} mm`}
      </output>
      <div className="grid grid-cols-3 gap-2 max-w-60">
        {['7', '8', '9', '4', '5', '6', '1', '2', '3'].map((k) => (
          <button key={k} type="button" className={KEY} onClick={() => press(k)}>
            {k}
          </button>
        ))}
        <button type="button" className={KEY} aria-label="decimal point" onClick={() => press('.')}>
          .
        </button>
        <button type="button" className={KEY} onClick={() => press('0')}>
          0
        </button>
        <button
          type="button"
          className={KEY}
          aria-label="delete the last digit"
          onClick={() => setText(text.slice(0, -1))}
        >
          ⌫
        </button>
      </div>
      <p className="text-sm text-muted mt-2">
        From {props.min.toFixed(1)} to {props.max.toFixed(1)} mm, to 0.1 mm.
      </p>
      <div className="flex flex-wrap gap-2 mt-2">
        <button
          type="button"
          disabled={value === null}
          onClick={() => value !== null && props.onUse(value)}
          className="min-h-16 min-w-16 px-5 rounded-xl border-2 border-gutta-strong bg-gutta-strong text-white text-xl font-bold disabled:opacity-50"
        >
          {value === null ? 'Use' : `Use ${value.toFixed(1)} mm`}
        </button>
        <button
          type="button"
          onClick={props.onCancel}
          className="min-h-16 min-w-16 px-5 rounded-xl border-2 border-ink bg-white text-xl font-bold"
        >
          Back to the ruler
        </button>
      </div>
    </div>
  );
}
