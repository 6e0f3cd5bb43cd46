import type { Clinic } from '../../lib/contract';
import { formatInstant } from '../../lib/present/format';
import { roleLabel } from '../../lib/present/labels';
import type { ThreadItem } from './useThread';

/** Comments oldest first, each with who and when; one still being sent or not taken says so. */
export function CommentList(props: {
  items: ThreadItem[];
  clinic: Clinic;
  onRetry: (id: string) => void;
  onDrop: (id: string) => void;
}) {
  if (props.items.length === 0) return null;
  return (
    <ol className="mt-1 flex flex-col gap-2">
      {props.items.map((item, i) => {
        const c = item.comment;
        return (
          <li
            key={c.id ?? `stored-${i}`}
            className={`rounded border-l-4 bg-paper px-3 py-2 ${
              item.state === 'failed' ? 'border-stop' : c.authorRole === 'student' ? 'border-line' : 'border-gutta'
            }`}
            data-testid="comment"
            data-state={item.state}
          >
            <p className="text-sm text-muted">
              <strong className="text-ink">{c.authorName}</strong> · {roleLabel(c.authorRole).toLowerCase()} ·{' '}
              <time dateTime={c.at}>{formatInstant(c.at, props.clinic)}</time>
              {item.state === 'sending' && <strong className="ml-2 text-ink">Sending…</strong>}
            </p>
            <p className={`whitespace-pre-wrap break-words ${item.state === 'stored' ? '' : 'text-muted'}`}>{c.text}</p>
            {item.state === 'failed' && (
              <div className="mt-1 flex flex-wrap items-center gap-2" role="alert">
                <strong className="text-stop">Not sent:</strong>
                <span>{item.error}</span>
                {c.id && item.retry && (
                  <button
                    type="button"
                    className="min-h-11 px-3 rounded border border-edge bg-white font-bold"
                    onClick={() => props.onRetry(c.id!)}
                  >
                    Send again
                  </button>
                )}
                {c.id && (
                  <button
                    type="button"
                    className="min-h-11 px-3 rounded border border-edge bg-white"
                    onClick={() => props.onDrop(c.id!)}
                  >
                    Edit
                  </button>
                )}
              </div>
            )}
          </li>
        );
      })}
    </ol>
  );
}
