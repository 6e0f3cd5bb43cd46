import { CALCULATOR_SOURCES, SOURCE_KINDS, sourceKind, type CalculatorId } from '../../lib/rules/core';

/** "`calculators.ts`, `floorToHalf`" with the code parts set as code. */
function SourceText({ text }: { text: string }) {
  return (
    <>{text.split('`').map((part, i) => (i % 2 === 1 ? <code key={i}>{part}</code> : <span key={i}>{part}</span>))}</>
  );
}

/** Where a calculator's values come from and how sure we are (docs/references.md), with what each label means. */
export function Sources({ id }: { id: CalculatorId }) {
  const list = CALCULATOR_SOURCES[id];
  const kinds = [...new Set(list.map((s) => sourceKind(s.label)))].filter((k) => k !== null);
  return (
    <section aria-labelledby={`${id}-sources`} className="mt-4 border-l-4 border-line pl-3" data-testid="sources">
      <h3 id={`${id}-sources`} className="text-lg font-bold">
        Where these values come from
      </h3>
      <ul className="mt-1 space-y-2">
        {list.map((s) => (
          <li key={s.value} className="text-base">
            <span className="inline-block mr-2 px-2 rounded border-2 border-ink font-bold text-sm" data-label={s.label}>
              {s.label}
            </span>
            {s.value}. <span className="text-muted">Source: </span>
            <cite className="not-italic">
              <SourceText text={s.source} />
            </cite>
          </li>
        ))}
      </ul>
      <dl className="mt-2 text-sm text-muted">
        {kinds.map((k) => (
          <div key={k}>
            <dt className="inline font-bold">{k}</dt>
            <dd className="inline">: {SOURCE_KINDS[k]}.</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
