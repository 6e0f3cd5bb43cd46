// The sign-off panel of the review page, shown only to those the sign-off service lets sign
// off: a canal's cone fit or fill check, or the whole case; approve or return; ratings per
// canal; a comment (required to return). A signed-off case offers the reopening instead.
// The server's refusals are shown beside the panel in its own words; after a sign-off is
// stored the page is loaded again, so everything on it comes from the server.
import { zodResolver } from '@hookform/resolvers/zod';
import { useEffect, useId, useRef, useState, useSyncExternalStore } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import type { CanalRatings, SignoffRequest } from '../../lib/contract';
import { postReopen, postSignoff, requestId, type Sent } from './api';
import { CHECKPOINT_LABEL, RATING_KEY_LABEL, RATING_LEVEL_LABEL } from '../../lib/present/review';
import { CASE_STATE_LABELS, type CaseState } from '../../lib/rules/lifecycle';
import { RATING_KEYS, RATING_LEVELS, type RatingLevel } from '../../lib/rules/review';
import { Counter } from './Composer';
import { reopenForm, signoffForm, type ReopenForm, type SignoffForm } from './forms';

export interface PanelCanal {
  id: string;
  /** "MB canal" */
  title: string;
}

interface Props {
  caseId: string;
  /** The state the page was rendered in: sent as expectedState. */
  state: CaseState;
  canals: PanelCanal[];
}

const DONE_KEY = (caseId: string) => `coneline:review-done:${caseId}`;

/** The canal a `#canal-{id}` address names, if it is one of these. */
function canalFromHash(canals: PanelCanal[]): string | null {
  const m = /^#canal-(.+)$/.exec(window.location.hash);
  return m && canals.some((c) => c.id === m[1]) ? m[1]! : null;
}

/**
 * A request sent again after no answer keeps its id, so it is stored at most once; any other
 * change to it makes a new request with a new id.
 */
function useRequestId() {
  const last = useRef<{ key: string; id: string; settled: boolean } | null>(null);
  return {
    idFor(body: unknown): string {
      const key = JSON.stringify(body);
      if (last.current && last.current.key === key && !last.current.settled) return last.current.id;
      last.current = { key, id: requestId(), settled: false };
      return last.current.id;
    },
    answered(settled: boolean) {
      if (last.current) last.current.settled = settled;
    },
  };
}

type Problem = { text: string; kind: 'refused' | 'unsent' | 'changed' };

function problemOf(answer: Exclude<Sent<unknown>, { kind: 'ok' }>): Problem {
  if (answer.kind === 'unsent')
    return {
      kind: 'unsent',
      text: `Not stored: ${answer.error} Send it again: the same request goes, so it is never stored twice.`,
    };
  if (answer.code === 'state-changed') return { kind: 'changed', text: answer.error };
  return { kind: 'refused', text: answer.error };
}

function Answer(props: { problem: Problem | null }) {
  if (!props.problem) return null;
  return (
    <div className="mt-3 rounded-lg border-2 border-stop bg-white p-3" role="alert" data-testid="signoff-problem">
      <p>
        <strong className="text-stop">{props.problem.kind === 'unsent' ? 'No answer. ' : 'Not signed off. '}</strong>
        {props.problem.text}
      </p>
      {props.problem.kind === 'changed' && (
        <button
          type="button"
          className="mt-2 min-h-11 px-4 rounded border border-edge bg-white font-bold"
          onClick={() => window.location.reload()}
        >
          Load the case again
        </button>
      )}
    </div>
  );
}

/** Keeps what was done for the page loaded after it, which says so once. */
function doneThenReload(caseId: string, words: string) {
  try {
    sessionStorage.setItem(DONE_KEY(caseId), words);
  } catch {
    /* storage refused: the page still shows the new state */
  }
  window.location.reload();
}

// Read once per page load: the words a sign-off left for the page loaded after it.
let doneWords: string | null | undefined;
function readDone(caseId: string): string | null {
  if (doneWords === undefined) {
    try {
      doneWords = sessionStorage.getItem(DONE_KEY(caseId));
      sessionStorage.removeItem(DONE_KEY(caseId));
    } catch {
      doneWords = null;
    }
  }
  return doneWords;
}
const noChanges = () => () => {};

function Done(props: { caseId: string }) {
  // The server renders no words; the browser shows them once hydrated.
  const words = useSyncExternalStore(
    noChanges,
    () => readDone(props.caseId),
    () => null,
  );
  return (
    <p role="status" className={words ? 'mb-3 rounded-lg border-2 border-ink bg-paper p-3 font-bold' : 'sr-only'}>
      {words ?? ''}
    </p>
  );
}

const radio = 'flex items-center gap-2 min-h-11 cursor-pointer';
const fieldError = 'text-stop font-bold text-sm';

function SignoffForm(props: Props) {
  const f = useId();
  const reqId = useRequestId();
  const [problem, setProblem] = useState<Problem | null>(null);
  const finalOpen = props.state === 'submitted';
  const {
    register,
    handleSubmit,
    control,
    setValue,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<SignoffForm>({
    resolver: zodResolver(signoffForm),
    defaultValues: {
      checkpoint: finalOpen ? 'final' : 'fill-check',
      canalId: props.canals[0]?.id ?? '',
      ratings: {},
      comment: '',
    },
  });
  useEffect(() => {
    const follow = () => {
      const id = canalFromHash(props.canals);
      if (id) setValue('canalId', id);
    };
    follow();
    window.addEventListener('hashchange', follow);
    return () => window.removeEventListener('hashchange', follow);
  }, [props.canals, setValue]);

  const [checkpoint, decision, canalId, comment] = useWatch({
    control,
    name: ['checkpoint', 'decision', 'canalId', 'comment'],
  });
  const rated = checkpoint === 'final' ? props.canals : props.canals.filter((c) => c.id === canalId);
  const commentLength = comment.length;

  const submit = handleSubmit(async (v) => {
    setProblem(null);
    const ratings: Record<string, CanalRatings> = {};
    for (const c of rated) {
      const levels: CanalRatings = {};
      for (const key of RATING_KEYS) {
        const level = v.ratings[c.id]?.[key];
        if (level) levels[key] = Number(level) as RatingLevel;
      }
      if (Object.keys(levels).length > 0) ratings[c.id] = levels;
    }
    const body: Omit<SignoffRequest, 'id'> = {
      checkpoint: v.checkpoint,
      ...(v.checkpoint === 'final' ? {} : { canalId: v.canalId }),
      decision: v.decision,
      ...(Object.keys(ratings).length > 0 ? { ratings } : {}),
      ...(v.comment.trim() ? { comment: v.comment.trim() } : {}),
      expectedState: props.state,
    };
    const answer = await postSignoff(props.caseId, { id: reqId.idFor(body), ...body });
    reqId.answered(answer.kind !== 'unsent');
    if (answer.kind === 'ok') {
      const what =
        v.checkpoint === 'final'
          ? 'the whole case'
          : `${CHECKPOINT_LABEL[v.checkpoint].toLowerCase()} of the ${props.canals.find((c) => c.id === v.canalId)?.title ?? 'canal'}`;
      doneThenReload(
        props.caseId,
        v.decision === 'approve' ? `Approved: ${what}.` : `Returned to the student: ${what}.`,
      );
      return;
    }
    if (
      answer.kind === 'refused' &&
      answer.status === 400 &&
      (answer.field === 'comment' || answer.field === 'canalId')
    )
      setError(answer.field, { message: answer.error });
    else setProblem(problemOf(answer));
  });

  return (
    <form noValidate onSubmit={submit} aria-describedby={`${f}-about`} data-testid="signoff-form">
      <p id={`${f}-about`} className="text-muted mb-2">
        The case is <strong className="text-ink">{CASE_STATE_LABELS[props.state].toLowerCase()}</strong>.
        {finalOpen
          ? ' Sign off a canal’s checkpoint, or approve or return the whole case.'
          : ' The whole case can be approved or returned once the student submits it; a canal’s checkpoints can be signed off now.'}
      </p>
      <fieldset className="mb-3">
        <legend className="font-bold">What you sign off</legend>
        {(['cone-fit', 'fill-check', 'final'] as const)
          .filter((c) => c !== 'final' || finalOpen)
          .map((c) => (
            <label key={c} className={radio}>
              <input type="radio" value={c} className="size-5" {...register('checkpoint')} />
              {c === 'final' ? 'The whole case (final)' : `${CHECKPOINT_LABEL[c]} of a canal`}
            </label>
          ))}
      </fieldset>
      {checkpoint !== 'final' && (
        <div className="mb-3 flex flex-col gap-1">
          <label htmlFor={`${f}-canal`} className="font-bold">
            Canal
          </label>
          <select
            id={`${f}-canal`}
            className="min-h-11 rounded border border-edge bg-white px-2"
            aria-invalid={errors.canalId ? true : undefined}
            aria-describedby={errors.canalId ? `${f}-canal-error` : undefined}
            {...register('canalId')}
          >
            {props.canals.map((c) => (
              <option key={c.id} value={c.id}>
                {c.title}
              </option>
            ))}
          </select>
          {errors.canalId && (
            <span id={`${f}-canal-error`} className={fieldError}>
              {errors.canalId.message}
            </span>
          )}
        </div>
      )}
      <fieldset className="mb-3" aria-describedby={errors.decision ? `${f}-decision-error` : undefined}>
        <legend className="font-bold">Decision</legend>
        <label className={radio}>
          <input type="radio" value="approve" className="size-5" {...register('decision')} />
          Approve
        </label>
        <label className={radio}>
          <input type="radio" value="return" className="size-5" {...register('decision')} />
          Return to the student
        </label>
        {errors.decision && (
          <span id={`${f}-decision-error`} className={fieldError}>
            {errors.decision.message}
          </span>
        )}
      </fieldset>
      {rated.map((c) => (
        <fieldset key={c.id} className="mb-3 rounded border border-line p-2">
          <legend className="font-bold px-1">Ratings for the {c.title} (optional)</legend>
          <div className="grid grid-cols-1 sm:grid-cols-2 xl:grid-cols-3 gap-2">
            {RATING_KEYS.map((key) => (
              <label key={key} className="flex flex-col text-sm">
                {RATING_KEY_LABEL[key]}
                <select
                  className="min-h-11 rounded border border-edge bg-white px-2 text-base"
                  {...register(`ratings.${c.id}.${key}`)}
                >
                  <option value="">Not rated</option>
                  {RATING_LEVELS.map((l) => (
                    <option key={l} value={String(l)}>
                      {l} · {RATING_LEVEL_LABEL[l]}
                    </option>
                  ))}
                </select>
              </label>
            ))}
          </div>
        </fieldset>
      ))}
      <div className="mb-3 flex flex-col gap-1">
        <label htmlFor={`${f}-comment`} className="font-bold">
          Comment {decision === 'return' ? '(required to return: what to put right)' : '(optional)'}
        </label>
        <textarea
          id={`${f}-comment`}
          rows={4}
          className="w-full rounded border border-edge bg-white p-2"
          aria-invalid={errors.comment ? true : undefined}
          aria-describedby={`${f}-comment-count${errors.comment ? ` ${f}-comment-error` : ''}`}
          {...register('comment')}
        />
        <Counter id={`${f}-comment-count`} length={commentLength} />
        {errors.comment && (
          <span id={`${f}-comment-error`} className={fieldError}>
            {errors.comment.message}
          </span>
        )}
      </div>
      <button
        type="submit"
        disabled={isSubmitting}
        className="min-h-12 px-6 rounded bg-gutta-strong text-white font-bold text-lg disabled:opacity-60"
      >
        {isSubmitting
          ? 'Sending…'
          : decision === 'return'
            ? 'Return to the student'
            : decision === 'approve'
              ? 'Approve'
              : 'Sign off'}
      </button>
      <Answer problem={problem} />
    </form>
  );
}

function ReopenPanel(props: Props) {
  const f = useId();
  const reqId = useRequestId();
  const [problem, setProblem] = useState<Problem | null>(null);
  const {
    register,
    handleSubmit,
    control,
    formState: { errors, isSubmitting },
  } = useForm<ReopenForm>({ resolver: zodResolver(reopenForm), defaultValues: { reason: '' } });
  const reason = useWatch({ control, name: 'reason' });
  const submit = handleSubmit(async (v) => {
    setProblem(null);
    const body = { reason: v.reason, expectedState: props.state };
    const answer = await postReopen(props.caseId, { id: reqId.idFor(body), ...body });
    reqId.answered(answer.kind !== 'unsent');
    if (answer.kind === 'ok') return doneThenReload(props.caseId, 'Reopened: the case is open to the student again.');
    setProblem(problemOf(answer));
  });
  return (
    <form noValidate onSubmit={submit} data-testid="reopen-form">
      <p className="text-muted mb-2">
        The case is signed off and locked. Reopening it returns it to the student; every sign-off is kept, and the
        approval is marked superseded.
      </p>
      <label htmlFor={`${f}-reason`} className="font-bold">
        Why it is reopened (required)
      </label>
      <textarea
        id={`${f}-reason`}
        rows={3}
        className="w-full rounded border border-edge bg-white p-2"
        aria-invalid={errors.reason ? true : undefined}
        aria-describedby={`${f}-reason-count${errors.reason ? ` ${f}-reason-error` : ''}`}
        {...register('reason')}
      />
      <Counter id={`${f}-reason-count`} length={reason.length} />
      {errors.reason && (
        <p id={`${f}-reason-error`} className={fieldError}>
          {errors.reason.message}
        </p>
      )}
      <p>
        <button
          type="submit"
          disabled={isSubmitting}
          className="mt-2 min-h-12 px-6 rounded bg-gutta-strong text-white font-bold text-lg disabled:opacity-60"
        >
          {isSubmitting ? 'Sending…' : 'Reopen the case'}
        </button>
      </p>
      <Answer problem={problem} />
    </form>
  );
}

export default function SignoffPanel(props: Props) {
  return (
    <div data-testid="signoff-panel">
      <Done caseId={props.caseId} />
      {props.state === 'approved' ? (
        <ReopenPanel {...props} />
      ) : props.state === 'discarded' ? (
        <p>This case was discarded: there is nothing to sign off.</p>
      ) : (
        <SignoffForm {...props} />
      )}
    </div>
  );
}
