import type { TabletCase } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { Answer, Answers, StepCard } from './AnswerButtons';

// Whether the case is locked is decided in views.ts, so the stepper can ask without loading this card.
export { lockOf } from '../../lib/client/views';

/** The card shown instead of the step cards while the case is locked. */
export function ReviewLock({ tablet, lock }: { tablet: TabletCase; lock: 'submitted' | 'approved' }) {
  const record = useChairside((s) => s.record);
  const submission = tablet.caseLevel.findLast((e) => e.type === 'case.submitted');
  if (lock === 'approved') {
    return (
      <StepCard
        title="Signed off"
        hint="Your attending signed this case off: it is locked. Ask them to reopen it if something must change."
      >
        <p className="text-lg">Nothing more can be recorded in this case.</p>
      </StepCard>
    );
  }
  return (
    <StepCard
      title="Waiting for review"
      hint="Nothing more is recorded while your attending reviews this case. To change something, withdraw the submission first; that works until your attending has acted on it."
    >
      {submission && (
        <Answers>
          <Answer
            onTap={() =>
              void record(
                'event.voided',
                { eventId: submission.id, reason: 'Submission withdrawn on the tablet' },
                { caseId: submission.caseId, label: 'submission withdrawn' },
              )
            }
          >
            Withdraw the submission
          </Answer>
        </Answers>
      )}
    </StepCard>
  );
}
