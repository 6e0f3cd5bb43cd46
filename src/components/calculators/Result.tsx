import type { ReactNode } from 'react';
import { floorToHalf } from '../../lib/rules/core';
import { mmValue } from '../../lib/present/format';

/** A length as a formula shows it: two decimals, a true minus sign (−1.50). */
export function exact(mm: number): string {
  return `${mm < 0 ? '−' : ''}${Math.abs(mm).toFixed(2)}`;
}

/**
 * A derived length, big (at least 40 px), rounded down to the 0.5 mm ruler step by the rules
 * core's floorToHalf, with the exact value beside it and how it was reached below.
 */
export function Result(props: {
  label: string;
  mm: number;
  testId: string;
  /** A step on the way to the answer: shown smaller than the answer. */
  minor?: boolean;
  children?: ReactNode;
}) {
  const ok = Number.isFinite(props.mm) && props.mm > 0;
  const shown = floorToHalf(props.mm);
  return (
    <div
      className={`rounded-xl border-2 bg-white p-3 mb-2 ${props.minor ? 'border-line' : 'border-ink'}`}
      data-testid={props.testId}
      data-mm={ok ? shown : undefined}
      aria-live="polite"
    >
      <p className="text-lg font-bold">{props.label}</p>
      {ok ? (
        <p className="flex flex-wrap items-baseline gap-x-4">
          <span
            className={`${props.minor ? 'text-3xl' : 'text-5xl'} font-bold tabular`}
            data-testid={`${props.testId}-shown`}
          >
            {mmValue(shown)} mm
          </span>
          <span className="text-lg text-muted tabular">
            exact {exact(props.mm)} mm
            {Math.abs(shown - props.mm) > 0.004 && ', rounded down to the 0.5 mm step'}
          </span>
        </p>
      ) : (
        <p className="text-2xl font-bold">— These lengths give no length: check them.</p>
      )}
      {props.children && <div className="text-base mt-1 tabular">{props.children}</div>}
    </div>
  );
}
