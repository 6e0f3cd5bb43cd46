import { useState } from 'react';
import { serverKnows } from '../../lib/contract';
import type { TabletCase } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { Answer, Answers, StepCard } from './AnswerButtons';

// Our own short reasons; the reason is free text on the wire (docs/sync-contract.md).
const REASONS = ['Opened by mistake', 'Wrong tooth', 'Wrong patient', 'Not treated today'] as const;

/** Whether the open case may be discarded: not submitted, no canal filled, and the server knows the event. */
export function canDiscard(tablet: TabletCase, serverContract: number): boolean {
  return (
    tablet.info !== null &&
    !tablet.info.submitted &&
    tablet.canals.every((c) => c.reading.result.state.unfilled) &&
    serverKnows('case.discarded', serverContract)
  );
}

/**
 * Discards the open case and goes back to the list; the undo strip can bring it back. Returns
 * whether the discard was recorded.
 */
export async function discardOpenCase(caseId: string, reason: string): Promise<boolean> {
  const { openCase, record } = useChairside.getState();
  openCase(null);
  const e = await record('case.discarded', { reason }, { caseId, label: 'case discarded' });
  if (e === null) openCase(caseId);
  return e !== null;
}

/** "Discard this case…": two taps, a reason, and the undo strip as a safety net. */
export function DiscardCase({ tablet }: { tablet: TabletCase }) {
  const serverContract = useChairside((s) => s.identity.serverContract);
  const [asking, setAsking] = useState(false);
  if (!tablet.caseId || !canDiscard(tablet, serverContract)) return null;
  const caseId = tablet.caseId;
  if (!asking) {
    return (
      <div className="mt-6">
        <button
          type="button"
          onClick={() => setAsking(true)}
          className="min-h-14 px-4 rounded-lg border-2 border-line bg-white text-lg underline"
        >
          Discard this case…
        </button>
      </div>
    );
  }
  return (
    <div className="mt-6">
      <StepCard
        title="Discard this case?"
        hint="For a case opened by mistake: it leaves your list and nothing more can be recorded in it. It stays on the record, and Undo brings it back."
      >
        <Answers>
          {REASONS.map((r) => (
            <Answer key={r} onTap={() => void discardOpenCase(caseId, r)}>
              {r}
            </Answer>
          ))}
          <Answer onTap={() => setAsking(false)}>Keep the case</Answer>
        </Answers>
      </StepCard>
    </div>
  );
}
