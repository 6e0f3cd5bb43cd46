import { useState } from 'react';
import { useChairside } from '../../lib/client/store';
import { Chip, ChipGroup } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';

// Why a CWL is usually corrected; free text on the wire, chips here (docs/sync-contract.md).
// A reason is required on the tablet: an empty one raises cwl-corrected-without-reason.
const REASONS = ['MAF radiograph', 'apex locator', 'reference point changed', 'length lost', 'other'] as const;
type Reason = (typeof REASONS)[number];

/** The reason as recorded: the chip's words, or for "other" the words typed (empty until typed). */
export function cwlReason(chip: Reason | null, typed: string): string {
  if (chip === null) return '';
  return chip === 'other' ? typed.trim() : chip;
}

/**
 * Correcting the CWL records `canal.cwlCorrected` with the reason chosen; every length check
 * is then judged against the new value (docs/rules.md), and the cards centre their rulers on it.
 */
export function CwlCorrection({ canalId, cwlMm }: { canalId: string; cwlMm: number }) {
  const [open, setOpen] = useState(false);
  const [chip, setChip] = useState<Reason | null>(null);
  const [typed, setTyped] = useState('');
  const record = useChairside((s) => s.record);
  const reason = cwlReason(chip, typed);
  const correct = async (v: number) => {
    if (reason === '') return;
    await record('canal.cwlCorrected', { cwlMm: v, reason }, { canalId, label: 'CWL corrected', value: `${mm(v)} mm` });
    setOpen(false);
    setChip(null);
    setTyped('');
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
          <ChipGroup label="Why is the CWL changing?">
            {REASONS.map((r) => (
              <Chip key={r} selected={chip === r} onTap={() => setChip(r)}>
                {r}
              </Chip>
            ))}
          </ChipGroup>
          {chip === 'other' && (
            <label className="block mt-2 text-lg">
              Say why
              <input
                type="text"
                value={typed}
                maxLength={200}
                onChange={(e) => setTyped(e.target.value)}
                className="block w-full min-h-14 mt-1 px-3 rounded-lg border-2 border-ink text-lg"
              />
            </label>
          )}
          {reason === '' ? (
            <p className="mt-2 text-lg" role="status" data-testid="cwl-reason-needed">
              Choose why the CWL is changing, then tap the new length.
            </p>
          ) : (
            <RulerStrip
              label="New CWL"
              centre={cwlMm}
              mark={{ mm: cwlMm, word: 'now', meaning: 'the CWL now' }}
              testId="cwl-ruler"
              onTap={(v) => void correct(v)}
            />
          )}
        </div>
      )}
    </section>
  );
}
