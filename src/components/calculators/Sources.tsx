import { calculatorSources, LABEL_MEANINGS, type CalculatorId } from '../../lib/rules/core';

/** Text as docs/references.md writes it, with its `code` parts set as code. */
function Md({ text }: { text: string }) {
  return (
    <>{text.split('`').map((part, i) => (i % 2 === 1 ? <code key={i}>{part}</code> : <span key={i}>{part}</span>))}</>
  );
}

/**
 * Where a calculator's values come from and how sure we are: the rows of the rules core's
 * referenceValues() (the same as docs/references.md, "Values in the code"), with what each
 * label means.
 */
export function Sources({ id }: { id: CalculatorId }) {
  const list = calculatorSources(id);
  const labels = [...new Set(list.map((v) => v.label))];
  return (
    <section aria-labelledby={`${id}-sources`} className="mt-4 border-l-4 border-line pl-3" data-testid="sources">
      <h3 id={`${id}-sources`} className="text-lg font-bold">
        Where these values come from
      </h3>
      <ul className="mt-1 space-y-2">
        {list.map((v) => (
          <li key={v.id} className="text-base" data-value={v.id}>
            <span className="inline-block mr-2 px-2 rounded border-2 border-ink font-bold text-sm">{v.label}</span>
            <Md text={v.what} />: <Md text={v.value} />. <span className="text-muted">Source: </span>
            <cite className="not-italic">
              <Md text={v.source} />
            </cite>
          </li>
        ))}
      </ul>
      <dl className="mt-2 text-sm text-muted">
        {labels.map((label) => (
          <div key={label}>
            <dt className="inline font-bold">{label}</dt>
            <dd className="inline">: {LABEL_MEANINGS[label]}.</dd>
          </div>
        ))}
      </dl>
    </section>
  );
}
