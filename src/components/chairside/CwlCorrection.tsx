import { useState } from 'react';
import { useChairside } from '../../lib/client/store';
import { Chip, ChipGroup } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';

// Why a CWL is usually corrected; free text on the wire, chips here (docs/sync-contract.md).
const REASONS = ['MAF radiograph', 'apex locator', 'other'] as const;

/**
 * Correcting the CWL records `canal.cwlCorrected`; every length check is then judged
 * against the new value (docs/rules.md), and the cards centre their rulers on it.
 */
export function CwlCorrection({ canalId, cwlMm }: { canalId: string; cwlMm: number }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState<string>(REASONS[0]);
  const record = useChairside((s) => s.record);
  const correct = async (v: number) => {
    await record('canal.cwlCorrected', { cwlMm: v, reason }, { canalId, label: 'CWL corrected', value: `${mm(v)} mm` });
    setOpen(false);
  };
  return (
    <section aria-label="Working length" className="mt-4">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => setOpen(!open)}
        className="min-h-14 min-w-14 px-4 rounded-lg border-2 border-ink bg-white text-lg font-bold"
      >
        {open ? 'Keep the CWL' : `Correct the CWL (${mm(cwlMm)} mm)`}
      </button>
      {open && (
        <div className="mt-2 bg-white border border-line rounded-lg p-3">
          <ChipGroup label="Corrected from">
            {REASONS.map((r) => (
              <Chip key={r} selected={reason === r} onTap={() => setReason(r)}>
                {r}
              </Chip>
            ))}
          </ChipGroup>
          <RulerStrip
            label="New CWL"
            centre={cwlMm}
            mark={{ mm: cwlMm, word: 'now', meaning: 'the CWL now' }}
            testId="cwl-ruler"
            onTap={(v) => void correct(v)}
          />
        </div>
      )}
    </section>
  );
}
