import { useId, useState, type SubmitEvent } from 'react';
import type { ConeFitItem, QueueRow } from '../../../lib/contract';
import { formatAgo, formatInstant, type Clinic } from '../../../lib/present/format';
import { REVIEW_LABEL } from '../../../lib/present/labels';
import { ApiError, postConeFitSignoff, requestId } from './queueApi';
import { BUTTON, caseTitle, FIELD } from './words';

interface Props {
  rows: readonly QueueRow[];
  clinic: Clinic;
  now: number;
  /** Called after a decision is stored or refused because the case changed: the queue reloads. */
  onDecided: (message: string) => void;
}

/**
 * Every pending cone-fit item of the rows shown, first on the page: a student may be waiting
 * at the chair. A request is approved or returned; an approval recorded at the chair is
 * confirmed or disputed (a return naming it). Each decision is a `cone-fit` sign-off.
 */
export function ConeFitList({ rows, clinic, now, onDecided }: Props) {
  const items = rows.flatMap((row) => row.coneFits.map((item) => ({ row, item })));
  if (items.length === 0) return null;
  return (
    <section aria-labelledby="conefit-h" className="mb-6">
      <h2 id="conefit-h" className="text-xl font-bold mb-3">
        Cone fits waiting ({items.length})
      </h2>
      <ul className="grid gap-3 lg:grid-cols-2">
        {items.map(({ row, item }) => (
          <li key={item.eventId}>
            <ConeFitCard row={row} item={item} clinic={clinic} now={now} onDecided={onDecided} />
          </li>
        ))}
      </ul>
    </section>
  );
}

type Decision = 'approve' | 'return';

function ConeFitCard({
  row,
  item,
  clinic,
  now,
  onDecided,
}: {
  row: QueueRow;
  item: ConeFitItem;
  clinic: Clinic;
  now: number;
  onDecided: (message: string) => void;
}) {
  // One id per decision, kept while the card stands: sending it again after a lost answer is the same sign-off.
  const [ids, setIds] = useState(() => ({ approve: requestId(), return: requestId() }));
  const [returning, setReturning] = useState(false);
  const [comment, setComment] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const formId = useId();
  const atChair = item.kind === 'at-chair';
  const words = atChair
    ? { approve: 'Confirm', return: 'Dispute', send: 'Send the dispute', ask: 'Why do you dispute this approval?' }
    : {
        approve: 'Approve cone fit',
        return: 'Return',
        send: 'Send the return',
        ask: 'What should the student put right?',
      };
  const who = `${row.student.name}, ${caseTitle(row)}, canal ${item.canalName}`;

  async function decide(decision: Decision) {
    setBusy(true);
    setError(null);
    try {
      await postConeFitSignoff(row.caseId, {
        id: ids[decision],
        checkpoint: 'cone-fit',
        canalId: item.canalId,
        decision,
        ...(decision === 'return' ? { comment: comment.trim() } : {}),
        expectedState: row.state,
      });
      const done = atChair
        ? decision === 'approve'
          ? 'confirmed'
          : 'disputed'
        : decision === 'approve'
          ? 'approved'
          : 'returned';
      onDecided(`Cone fit of canal ${item.canalName} (${row.student.name}, ${caseTitle(row)}) ${done}.`);
    } catch (e) {
      // The server answered: that id now stands for this answer, so a new decision needs new ids.
      // (A lost connection keeps them, so sending again cannot sign twice.)
      if (e instanceof ApiError) setIds({ approve: requestId(), return: requestId() });
      if (e instanceof ApiError && e.code === 'state-changed') {
        const now = e.state && e.state in REVIEW_LABEL ? REVIEW_LABEL[e.state as keyof typeof REVIEW_LABEL] : e.state;
        onDecided(
          `Nothing was signed: ${row.student.name}'s ${caseTitle(row)} changed since the queue was loaded${now ? ` (it is now "${now}")` : ''}. The queue has been refreshed; open the case before deciding.`,
        );
        return;
      }
      setError(e instanceof Error ? e.message : 'The sign-off could not be sent.');
    } finally {
      setBusy(false);
    }
  }

  function sendReturn(ev: SubmitEvent<HTMLFormElement>) {
    ev.preventDefault();
    if (!comment.trim()) {
      setError(
        atChair ? 'Say why you dispute it: the student reads this.' : 'Say what to put right: the student reads this.',
      );
      return;
    }
    void decide('return');
  }

  return (
    <article className="bg-white border-2 border-gutta rounded-lg p-4" aria-label={`Cone fit: ${who}`}>
      <p className="font-bold text-lg">
        {row.student.name} · {caseTitle(row)} · canal {item.canalName}
      </p>
      <p className="mt-1">
        {atChair ? (
          <>
            <strong>Approved at the chair</strong>
            {item.attendingName ? ` by ${item.attendingName}` : ' (attending not known)'}, not yet confirmed
          </>
        ) : (
          <strong>Cone fit approval requested</strong>
        )}{' '}
        <span className="text-muted">
          {formatAgo(item.recordedAt, now, clinic)} ({formatInstant(item.recordedAt, clinic)})
        </span>
      </p>
      {error && (
        <p role="alert" className="mt-2 text-stop font-bold">
          {error}
        </p>
      )}
      {returning ? (
        <form className="mt-3" onSubmit={sendReturn} aria-describedby={`${formId}-hint`}>
          <label htmlFor={`${formId}-comment`} className="block font-bold">
            {words.ask}
          </label>
          <p id={`${formId}-hint`} className="text-sm text-muted">
            The student sees this on the tablet.
          </p>
          <textarea
            id={`${formId}-comment`}
            className={`${FIELD} mt-1 min-h-24 py-2`}
            maxLength={2000}
            aria-required="true"
            value={comment}
            onChange={(e) => {
              setComment(e.target.value);
              setError(null);
            }}
          />
          <div className="mt-2 flex flex-wrap gap-2">
            <button type="submit" disabled={busy} className={BUTTON.primary}>
              {words.send}
            </button>
            <button type="button" disabled={busy} className={BUTTON.plain} onClick={() => setReturning(false)}>
              Cancel
            </button>
          </div>
        </form>
      ) : (
        <div className="mt-3 flex flex-wrap gap-2">
          <button
            type="button"
            disabled={busy}
            className={BUTTON.primary}
            aria-label={`${words.approve}: ${who}`}
            onClick={() => void decide('approve')}
          >
            {words.approve}
          </button>
          <button
            type="button"
            disabled={busy}
            className={BUTTON.plain}
            aria-label={`${words.return}: ${who}`}
            onClick={() => {
              setError(null);
              setReturning(true);
            }}
          >
            {words.return}
          </button>
          <a className={BUTTON.link} href={`/cases/${row.caseId}`}>
            Open the case
          </a>
        </div>
      )}
    </article>
  );
}
