import { useRef, useState } from 'react';
import { fdiToUniversal, toothName } from '../../lib/rules/core';
import { newId } from '../../lib/client/ids';
import { useChairside } from '../../lib/client/store';
import type { Setting } from '../../lib/client/derive';
import { Answer, Answers, Chip, StepCard } from './AnswerButtons';
import { Guarded } from './useCardGuard';

const QUADRANTS: Record<number, string> = {
  1: 'upper right',
  2: 'upper left',
  3: 'lower left',
  4: 'lower right',
  5: 'upper right',
  6: 'upper left',
  7: 'lower left',
  8: 'lower right',
};

/** Open a case: setting, then the tooth in two taps (quadrant, tooth), and for a patient the chart number. */
export function OpenCase({ onCancel }: { onCancel?: () => void }) {
  const record = useChairside((s) => s.record);
  const openCase = useChairside((s) => s.openCase);
  const showUniversal = useChairside((s) => s.showUniversal);
  const toggleUniversal = useChairside((s) => s.toggleUniversal);
  const [setting, setSetting] = useState<Setting | null>(null);
  const [primary, setPrimary] = useState(false);
  const [quadrant, setQuadrant] = useState<number | null>(null);
  const [tooth, setTooth] = useState<number | null>(null);
  const [chartRef, setChartRef] = useState('');

  // One case per decision: a second tap while the first is being recorded opens nothing more.
  const opening = useRef(false);
  const open = async (data: { setting: Setting; tooth?: number; chartRef?: string }) => {
    if (opening.current) return;
    opening.current = true;
    const caseId = newId();
    const label = data.tooth ? `case opened, tooth ${data.tooth}` : 'case opened, training block';
    const ev = await record('case.opened', data, { caseId, label });
    opening.current = false;
    if (ev) openCase(caseId);
  };
  // Each step replaces the one before in place: a double tap must not answer the next one too.
  return <Guarded screen={`${setting}|${quadrant}|${tooth}`}>{steps()}</Guarded>;

  function steps() {
    if (!setting) {
      return (
        <StepCard title="What are you filling?" hint="A new case: one tooth (or block), canal by canal.">
          <Answers>
            <Answer
              tone="primary"
              onTap={() => {
                setSetting('block');
                void open({ setting: 'block' });
              }}
            >
              Training block
            </Answer>
            <Answer tone="primary" onTap={() => setSetting('extracted')}>
              Extracted tooth
            </Answer>
            <Answer tone="primary" onTap={() => setSetting('patient')}>
              Patient
            </Answer>
            {onCancel && <Answer onTap={onCancel}>Back</Answer>}
          </Answers>
        </StepCard>
      );
    }
    if (setting === 'block') return <p className="text-lg">Opening…</p>;

    const quadrants = primary ? [5, 6, 7, 8] : [1, 2, 3, 4];
    if (quadrant === null) {
      return (
        <StepCard title="Which quadrant?" hint="FDI quadrant as seen facing the patient.">
          <Answers>
            {quadrants.map((q) => (
              <Answer key={q} onTap={() => setQuadrant(q)} testId={`quadrant-${q}`}>
                <span className="tabular">{q}</span> <span className="text-base font-normal">{QUADRANTS[q]}</span>
              </Answer>
            ))}
          </Answers>
          <div className="mt-3 flex flex-wrap gap-2">
            <Chip selected={primary} onTap={() => setPrimary(!primary)}>
              Primary teeth
            </Chip>
            <Answer onTap={() => setSetting(null)}>Back</Answer>
          </div>
        </StepCard>
      );
    }

    const teeth = Array.from({ length: primary ? 5 : 8 }, (_, i) => quadrant * 10 + i + 1);
    if (setting === 'extracted' || tooth === null) {
      return (
        <StepCard title="Which tooth?" hint={`Quadrant ${quadrant}, ${QUADRANTS[quadrant]}.`}>
          <Answers>
            {teeth.map((t) => (
              <Answer
                key={t}
                testId={`tooth-${t}`}
                onTap={() => (setting === 'extracted' ? void open({ setting, tooth: t }) : setTooth(t))}
              >
                <span className="tabular text-2xl">{t}</span>
                <span className="block text-sm font-normal">{toothName(t).split(' ').slice(2).join(' ')}</span>
                {showUniversal && <span className="block text-sm font-normal">Universal {fdiToUniversal(t)}</span>}
              </Answer>
            ))}
          </Answers>
          <div className="mt-3 flex flex-wrap gap-2">
            <Chip selected={showUniversal} onTap={toggleUniversal}>
              Show Universal numbers
            </Chip>
            <Answer onTap={() => setQuadrant(null)}>Back</Answer>
          </div>
        </StepCard>
      );
    }

    return (
      <StepCard title="Chart number" hint={`Tooth ${tooth}. The clinic's chart number only — no names.`}>
        <label className="block text-lg font-bold mb-2" htmlFor="chart-ref">
          Chart number
        </label>
        <input
          id="chart-ref"
          value={chartRef}
          onChange={(e) => setChartRef(e.target.value)}
          inputMode="text"
          autoComplete="off"
          maxLength={64}
          className="min-h-14 w-full max-w-sm px-3 text-2xl border-2 border-ink rounded-lg"
        />
        <div className="mt-3">
          <Answers>
            <Answer
              tone="primary"
              disabled={chartRef.trim() === ''}
              onTap={() => void open({ setting: 'patient', tooth, chartRef: chartRef.trim() })}
            >
              Open case
            </Answer>
            <Answer onTap={() => setTooth(null)}>Back</Answer>
          </Answers>
        </div>
      </StepCard>
    );
  }
}
