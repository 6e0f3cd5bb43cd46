import type { Finding, Severity } from '../../lib/rules/core';
import { bySeverity, SEVERITY_WORD } from '../../lib/present/labels';

const TEXT: Record<Severity, string> = { stop: 'text-stop', caution: 'text-caution', note: 'text-note' };

/** The severity's shape (square, triangle, circle) and word: colour never stands alone. */
export function SeverityMark({ severity }: { severity: Severity }) {
  return (
    <span className={`inline-flex items-center gap-1 font-bold ${TEXT[severity]}`}>
      <svg width="18" height="18" viewBox="0 0 18 18" aria-hidden="true" className="shrink-0">
        {severity === 'stop' && <rect x="2" y="2" width="14" height="14" fill="currentColor" />}
        {severity === 'caution' && <polygon points="9,1 17,16 1,16" fill="currentColor" />}
        {severity === 'note' && <circle cx="9" cy="9" r="7" fill="currentColor" />}
      </svg>
      {SEVERITY_WORD[severity]}
    </span>
  );
}

/** Findings sorted stops first, each with its mark and the message for the student. */
export function FindingList(props: { findings: Finding[]; source: 'server' | 'tablet'; empty?: string }) {
  const list = bySeverity(props.findings);
  return (
    <section aria-label="Findings" className="mt-3" data-testid="findings-panel" data-source={props.source}>
      <h3 className="text-lg font-bold">
        Findings{' '}
        <span className="text-sm font-normal text-muted">
          ({props.source === 'server' ? 'checked by the server' : 'checked on this tablet'})
        </span>
      </h3>
      {list.length === 0 ? (
        <p className="text-base text-muted" data-testid="no-findings">
          {props.empty ?? 'Nothing to flag so far.'}
        </p>
      ) : (
        <ul className="flex flex-col gap-2 mt-1" data-testid="findings">
          {list.map((f, i) => (
            <li key={`${f.code}-${f.eventId ?? i}`} data-code={f.code} className="border-l-4 pl-2 border-line">
              <SeverityMark severity={f.severity} /> <span className="text-base">{f.message}</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}

/** The value just entered, big, with the rules core's verdict on it beside. */
export function JustEntered(props: { label: string; value: string; findings: Finding[] }) {
  return (
    <div className="flex flex-wrap items-center gap-4 my-2" aria-live="polite" data-testid="just-entered">
      <div>
        <p className="text-sm text-muted">{props.label}</p>
        {/* A length is shown at 48 px; a phrase (a sear level in words) at 40 px, so it wraps less. */}
        <p className={`${props.value.length > 12 ? 'text-[2.5rem]' : 'text-5xl'} font-bold tabular leading-none`}>
          {props.value}
        </p>
      </div>
      <div className="text-lg">
        {props.findings.length === 0 ? (
          <span className="font-bold text-ink" data-testid="verdict">
            ✓ No finding
          </span>
        ) : (
          <ul data-testid="verdict">
            {props.findings.map((f, i) => (
              <li key={i}>
                <SeverityMark severity={f.severity} /> <span className="text-base">{f.message}</span>
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}
