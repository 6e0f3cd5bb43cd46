import type { ReactNode } from 'react';

/** A one-tap answer: at least 64 × 64 px, for gloved fingers. */
export function Answer(props: {
  children: ReactNode;
  onTap: () => void;
  tone?: 'primary' | 'plain' | 'warn';
  disabled?: boolean;
  testId?: string;
  wide?: boolean;
}) {
  const tone = props.tone ?? 'plain';
  const cls =
    tone === 'primary'
      ? 'bg-gutta-strong text-white border-gutta-strong'
      : tone === 'warn'
        ? 'bg-white text-stop border-stop'
        : 'bg-white text-ink border-ink';
  return (
    <button
      type="button"
      data-testid={props.testId}
      disabled={props.disabled}
      onClick={props.onTap}
      className={`min-h-16 min-w-16 px-5 rounded-xl border-2 text-xl font-bold ${cls} ${props.wide ? 'flex-1' : ''} disabled:opacity-50 active:translate-y-px`}
    >
      {props.children}
    </button>
  );
}

/** A row of one-tap answers with 8 px gaps. */
export function Answers({ children }: { children: ReactNode }) {
  return <div className="flex flex-wrap gap-2">{children}</div>;
}

/** A choice that stays selected (chips, toggles): at least 56 × 56 px. */
export function Chip(props: {
  children: ReactNode;
  selected: boolean;
  onTap: () => void;
  style?: React.CSSProperties;
  testId?: string;
  label?: string;
}) {
  return (
    <button
      type="button"
      aria-pressed={props.selected}
      aria-label={props.label}
      data-testid={props.testId}
      onClick={props.onTap}
      style={props.style}
      className={`min-h-14 min-w-14 px-4 rounded-lg border-2 text-lg font-bold ${
        props.selected ? 'border-ink ring-4 ring-gutta' : 'border-edge'
      } ${props.style ? '' : props.selected ? 'bg-ink text-white' : 'bg-white text-ink'}`}
    >
      {props.selected && <span aria-hidden="true">✓ </span>}
      {props.children}
    </button>
  );
}

/** A labelled group of chips. */
export function ChipGroup({ label, children }: { label: string; children: ReactNode }) {
  return (
    <fieldset className="mb-2">
      <legend className="text-base font-bold mb-1">{label}</legend>
      <div className="flex flex-wrap gap-2">{children}</div>
    </fieldset>
  );
}

/** The card frame: one question per card. */
export function StepCard({ title, hint, children }: { title: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <section
      aria-labelledby="step-title"
      className="bg-white rounded-2xl border-2 border-gutta p-4 landscape:py-3 shadow-sm"
    >
      <h2 id="step-title" className="text-2xl font-bold mb-1">
        {title}
      </h2>
      {hint && <p className="text-base text-muted mb-2">{hint}</p>}
      {children}
    </section>
  );
}
