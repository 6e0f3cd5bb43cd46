// The case page's island for one canal (or the tooth as a whole): its timeline, each event
// with the findings it raised and a button to comment on it, and the thread on the canal (or
// the case). Comments go to POST /api/cases/{caseId}/comments; the student answers here too.
import { useId, useState } from 'react';
import type { Clinic, ReviewComment } from '../../lib/contract';
import { SeverityMark } from '../chairside/FindingList';
import { CommentList } from './CommentList';
import { Composer } from './Composer';
import type { Reader, TimelineLine } from './types';
import { useThread } from './useThread';

interface Props {
  caseId: string;
  /** The canal this island is about; null for the tooth as a whole. */
  canalId: string | null;
  /** "the MB canal", "the case": what the thread is on. */
  about: string;
  lines: TimelineLine[];
  timelineTitle?: string;
  comments: ReviewComment[];
  reader: Reader;
  clinic: Clinic;
  /** The case takes comments (it does unless discarded). */
  mayComment: boolean;
  /** Show the thread on the canal or case itself (not only the events'). */
  thread: boolean;
  /** The thread's heading level: 3 inside a canal, 2 where the thread is a section of its own. */
  level?: 2 | 3;
}

export default function Discussion(props: Props) {
  const { items, add, retry, drop } = useThread(props.caseId, props.comments, props.reader);
  const [open, setOpen] = useState<string | null>(null);
  const [restore, setRestore] = useState<{ anchor: string; text: string; n: number } | null>(null);
  const headingId = useId();
  const anchor = props.canalId ? { canalId: props.canalId } : {};
  const back = (id: string, key: string) => {
    const text = drop(id);
    setRestore((r) => ({ anchor: key, text, n: (r?.n ?? 0) + 1 }));
    if (key !== 'thread') setOpen(key);
  };
  const restoreFor = (key: string) => (restore?.anchor === key ? restore : undefined);
  const onEvent = (eventId: string) => items.filter((i) => i.comment.eventId === eventId);
  const onThread = items.filter((i) => i.comment.eventId === null);
  const Heading = props.level === 2 ? 'h2' : 'h3';

  return (
    <>
      {props.lines.length > 0 && (
        <>
          <h3 className="text-lg font-bold mt-4">{props.timelineTitle ?? 'Timeline'}</h3>
          <ol className="mt-1">
            {props.lines.map((line) => {
              const here = onEvent(line.id);
              return (
                <li key={line.id} id={`event-${line.id}`} className="border-t border-line py-1" data-testid="event">
                  <div className="flex flex-wrap items-start gap-x-3 gap-y-1">
                    <span
                      className={`text-sm text-muted tabular shrink-0 pt-0.5 ${line.time.length > 5 ? 'w-40' : 'w-12'}`}
                    >
                      {line.time}
                    </span>
                    <span className="min-w-0 flex-1">
                      {line.withdrawn ? (
                        <>
                          <s>{line.words}</s> <span className="text-muted">(withdrawn)</span>
                        </>
                      ) : (
                        line.words
                      )}
                      {line.findings.length > 0 && (
                        <ul className="mt-0.5 flex flex-col" aria-label="Findings this step raised">
                          {line.findings.map((f, i) => (
                            <li key={`${f.code}-${i}`} className="text-sm" data-code={f.code}>
                              {f.cleared ? (
                                <span className="text-muted">
                                  <s>{f.title}</s> — put right {f.cleared}
                                </span>
                              ) : (
                                <>
                                  <SeverityMark severity={f.severity} /> {f.title}
                                </>
                              )}
                            </li>
                          ))}
                        </ul>
                      )}
                    </span>
                    {props.mayComment && (
                      <button
                        type="button"
                        className="min-h-11 px-3 rounded border border-edge bg-white text-sm font-bold shrink-0"
                        aria-expanded={open === line.id}
                        onClick={() => setOpen(open === line.id ? null : line.id)}
                      >
                        Comment<span className="sr-only"> on {`${line.time} ${line.words}`}</span>
                        {here.length > 0 ? ` (${here.length})` : ''}
                      </button>
                    )}
                  </div>
                  {(here.length > 0 || open === line.id) && (
                    <div className="ml-0 sm:ml-15 mb-2">
                      <CommentList
                        items={here}
                        clinic={props.clinic}
                        onRetry={retry}
                        onDrop={(id) => back(id, line.id)}
                      />
                      {open === line.id && (
                        <Composer
                          label={`Your comment on this step (${line.time})`}
                          focusOnOpen
                          restore={restoreFor(line.id)}
                          onCancel={() => setOpen(null)}
                          onSend={(text) => add({ ...anchor, eventId: line.id }, text)}
                        />
                      )}
                    </div>
                  )}
                </li>
              );
            })}
          </ol>
        </>
      )}
      {props.thread && (
        <section aria-labelledby={headingId} className="mt-4" data-testid="thread">
          <Heading id={headingId} className={props.level === 2 ? 'text-2xl font-bold' : 'text-lg font-bold'}>
            Comments on {props.about}
          </Heading>
          {onThread.length === 0 && <p className="text-muted">No comments yet.</p>}
          <CommentList items={onThread} clinic={props.clinic} onRetry={retry} onDrop={(id) => back(id, 'thread')} />
          {props.mayComment && (
            <Composer
              label={`Your comment on ${props.about}`}
              restore={restoreFor('thread')}
              onSend={(text) => add(anchor, text)}
            />
          )}
        </section>
      )}
    </>
  );
}
