import { useState } from 'react';
import { serverKnows } from '../../lib/contract';
import type { CanalInfo } from '../../lib/client/derive';
import { coneFitOf, useNews } from '../../lib/client/news';
import { useChairside } from '../../lib/client/store';
import { DEFAULT_CLINIC, formatInstant } from '../../lib/present/format';
import { Answer, Answers } from './AnswerButtons';
import { SeverityMark } from './FindingList';
import { useCardGuard } from './useCardGuard';

/**
 * The cone fit at the chair (docs/review.md), on the cone-fit card and the sealing card: ask
 * the attending to check the cone fit, or record that they approved it at the chair (an
 * operatory with no network), and where that stands. On the sealing card, while the course
 * asks for the approval and none stands, a stop says so before the cone is sealed. Loaded
 * with the first of those cards, never with the first paint.
 */
export function ConeFitPanel({ canal, caseId, seal }: { canal: CanalInfo; caseId: string; seal: boolean }) {
  const user = useChairside((s) => s.identity.user);
  const serverContract = useChairside((s) => s.identity.serverContract);
  const record = useChairside((s) => s.record);
  const news = useNews(caseId);
  const [picking, setPicking] = useState(false);
  // Choosing an attending replaces the buttons: a gloved double tap must not pick one at once.
  const guard = useCardGuard(picking ? 'picking' : 'asking');
  const clinic = user?.clinic ?? DEFAULT_CLINIC;
  const attendings = user?.attendings ?? [];
  const standing = coneFitOf(canal.canalId, canal.reading.counted, news);
  const nameOf = (id: string) => attendings.find((a) => String(a.id) === id)?.name ?? 'Your attending';
  const when = (at: string) => formatInstant(at, clinic, 'time');
  // A tablet newer than its server records nothing the server would not know (contract version 3).
  const knows = serverKnows('conefit.requested', serverContract);
  const rec = (type: 'conefit.requested', label: string) => record(type, {}, { canalId: canal.canalId, label });

  const { record: pending, signoff } = standing;
  let status: string | null = null;
  if (standing.status === 'waiting' && pending)
    status = `Waiting for your attending to check it (asked at ${when(pending.at)}).`;
  else if (standing.status === 'at-chair' && pending?.type === 'conefit.approvedAtChair')
    status = `${nameOf(pending.data.attendingId)} approved it at the chair (recorded at ${when(pending.at)}), not yet confirmed.`;
  else if (standing.status === 'approved' && signoff)
    status = `Approved by ${signoff.attendingName} at ${when(signoff.at)}.${signoff.comment ? ` ${signoff.comment}` : ''}`;
  else if (standing.status === 'returned' && signoff)
    status = `Returned by ${signoff.attendingName} at ${when(signoff.at)}: ${signoff.comment ?? ''}`;

  const stop = seal && user?.requireConeFitApproval === true && !standing.approved;
  return (
    <section
      aria-label="The attending's check of the cone fit"
      className="mt-3 bg-white rounded-2xl border-2 border-line p-4"
      data-testid="conefit-panel"
      data-status={standing.status}
      data-armed={guard.armed}
      onClickCapture={guard.onClickCapture}
    >
      {stop && (
        <p className="text-lg border-l-4 border-stop pl-3 mb-2" data-testid="conefit-stop">
          <SeverityMark severity="stop" /> Your school asks your attending to approve the cone fit before you seal this
          canal. Ask them, or record that they approved it at the chair.
        </p>
      )}
      {status && (
        <p
          className={`text-lg mb-2 ${standing.status === 'returned' ? 'font-bold text-stop' : 'font-bold'}`}
          data-testid="conefit-status"
          role="status"
        >
          {status}
        </p>
      )}
      {!knows ? (
        <p className="text-base text-muted">This server does not take cone-fit requests yet.</p>
      ) : picking ? (
        <div>
          <p className="text-base font-bold mb-1" id="pick-attending">
            Which attending approved it at the chair?
          </p>
          {attendings.length === 0 && (
            <p className="text-base mb-2">
              No attending of yours is kept on this tablet: sign in once while online to fetch them.
            </p>
          )}
          <Answers>
            {attendings.map((a) => (
              <Answer
                key={a.id}
                tone="primary"
                testId={`attending-${a.id}`}
                onTap={() => {
                  setPicking(false);
                  void record(
                    'conefit.approvedAtChair',
                    { attendingId: String(a.id) },
                    { canalId: canal.canalId, label: `cone fit approved at the chair by ${a.name}` },
                  );
                }}
              >
                {a.name}
              </Answer>
            ))}
            <Answer onTap={() => setPicking(false)}>Cancel</Answer>
          </Answers>
        </div>
      ) : (
        <Answers>
          {!standing.pending && (
            <Answer testId="ask-conefit" onTap={() => void rec('conefit.requested', 'cone-fit check asked for')}>
              {standing.status === 'none' ? 'Ask the attending to check the cone fit' : 'Ask for another check'}
            </Answer>
          )}
          {standing.status !== 'at-chair' && standing.status !== 'approved' && (
            <Answer testId="at-chair" onTap={() => setPicking(true)}>
              The attending approved it at the chair
            </Answer>
          )}
        </Answers>
      )}
    </section>
  );
}
