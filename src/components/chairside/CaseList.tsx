import { lazy, Suspense, useEffect, useMemo, useState } from 'react';
import { SETTING_LABEL } from '../../lib/present/labels';
import { DEFAULT_CLINIC, formatInstant } from '../../lib/present/format';
import { fetchCases, type CaseSummary } from '../../lib/client/api';
import { casesOnTablet } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { Answer, Answers, StepCard } from './AnswerButtons';

// The "came back" mark of a returned case, with its comment (loaded after the first paint).
const CameBack = lazy(() => import('./CaseNews').then((m) => ({ default: m.CameBack })));

/** The start screen: open a new case, go on with one on this tablet, or fetch one from the server. */
export function CaseList({ onNew }: { onNew: () => void }) {
  const rows = useChairside((s) => s.rows);
  const openCase = useChairside((s) => s.openCase);
  const restoreCase = useChairside((s) => s.restoreCase);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  const cases = useMemo(() => casesOnTablet(rows), [rows]);
  const [remote, setRemote] = useState<CaseSummary[]>([]);
  useEffect(() => {
    let live = true;
    void fetchCases().then((a) => {
      if (live && a.kind === 'ok') setRemote(a.value.cases ?? []);
    });
    return () => {
      live = false;
    };
  }, []);
  const onTablet = new Set(cases.map((c) => c.caseId));
  // A returned case is worked on again: it may be fetched from another device too.
  const elsewhere = remote.filter((c) => (!c.submitted || c.reviewStatus === 'returned') && !onTablet.has(c.caseId));
  return (
    <div className="flex flex-col gap-4">
      <StepCard title="Chairside" hint="One tooth at a time, canal by canal.">
        <Answers>
          <Answer tone="primary" onTap={onNew} testId="new-case">
            Open a new case
          </Answer>
        </Answers>
      </StepCard>
      {cases.length > 0 && (
        <section aria-labelledby="on-tablet" className="bg-white rounded-2xl border border-line p-4">
          <h2 id="on-tablet" className="text-xl font-bold mb-2">
            On this tablet
          </h2>
          <ul className="flex flex-col gap-2">
            {cases.map((c) => (
              <li key={c.caseId} className="flex flex-wrap items-center gap-3">
                <Answer onTap={() => openCase(c.caseId)}>{c.tooth ? `Tooth ${c.tooth}` : 'Block'}</Answer>
                <span className="text-base">
                  {SETTING_LABEL[c.setting]} · opened {formatInstant(c.openedAt, clinic)}
                  {c.submitted ? ' · submitted' : ''}
                </span>
                <Suspense fallback={null}>
                  <CameBack caseId={c.caseId} remote={remote} />
                </Suspense>
              </li>
            ))}
          </ul>
        </section>
      )}
      {elsewhere.length > 0 && (
        <section aria-labelledby="on-server" className="bg-white rounded-2xl border border-line p-4">
          <h2 id="on-server" className="text-xl font-bold mb-2">
            Open cases from another device
          </h2>
          <ul className="flex flex-col gap-2">
            {elsewhere.map((c) => (
              <li key={c.caseId} className="flex flex-wrap items-center gap-3">
                <Answer onTap={() => void restoreCase(c.caseId)}>
                  {c.tooth ? `Fetch tooth ${c.tooth}` : 'Fetch block'}
                </Answer>
                <span className="text-base">
                  {SETTING_LABEL[c.setting]} · {c.canals.map((k) => k.name).join(', ')}
                </span>
                <Suspense fallback={null}>
                  <CameBack caseId={c.caseId} remote={remote} />
                </Suspense>
              </li>
            ))}
          </ul>
        </section>
      )}
    </div>
  );
}
