// The comments of one island (a canal's, or the case's), with the ones this reader is still
// sending. A comment shows at once, marked "Sending…" until the server has it; one the server
// did not take stays marked "Not sent" with the reason, and is sent again under the same id
// (the server keeps the first answer for an id, so a retry can never post it twice).
import { useCallback, useEffect, useRef, useState } from 'react';
import type { ReviewComment } from '../../lib/contract';
import { postComment, requestId } from './api';
import type { Reader } from './types';

export interface Draft {
  id: string;
  canalId?: string;
  eventId?: string;
  text: string;
}

export type ThreadItem =
  | { state: 'stored'; comment: ReviewComment }
  | {
      state: 'sending' | 'failed';
      draft: Draft;
      comment: ReviewComment;
      error?: string;
      /** False when the server refused it for good (sending it again would get the same refusal). */
      retry?: boolean;
    };

function shown(draft: Draft, reader: Reader): ReviewComment {
  return {
    id: draft.id,
    canalId: draft.canalId ?? null,
    eventId: draft.eventId ?? null,
    authorId: reader.id,
    authorName: reader.name,
    authorRole: reader.role,
    text: draft.text.trim(),
    at: new Date().toISOString(),
  };
}

/** One island's comments and the way to add one. */
export function useThread(caseId: string, initial: ReviewComment[], reader: Reader) {
  const [items, setItems] = useState<ThreadItem[]>(() => initial.map((comment) => ({ state: 'stored', comment })));
  const unsent = items.some((i) => i.state !== 'stored');
  const live = useRef(true);
  useEffect(
    () => () => {
      live.current = false;
    },
    [],
  );

  // Leaving the page with a comment not yet stored would lose it: let the browser ask first.
  useEffect(() => {
    if (!unsent) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [unsent]);

  const send = useCallback(
    async (draft: Draft) => {
      const replace = (next: ThreadItem) => setItems((list) => list.map((i) => (i.comment.id === draft.id ? next : i)));
      const answer = await postComment(caseId, {
        id: draft.id,
        ...(draft.canalId ? { canalId: draft.canalId } : {}),
        ...(draft.eventId ? { eventId: draft.eventId } : {}),
        text: draft.text,
      });
      if (!live.current) return;
      if (answer.kind === 'ok') replace({ state: 'stored', comment: answer.value.comment });
      else
        replace({
          state: 'failed',
          draft,
          comment: shown(draft, reader),
          error: answer.error,
          retry: answer.kind === 'unsent',
        });
    },
    [caseId, reader],
  );

  /** Shows the comment at once and sends it. */
  const add = useCallback(
    (anchor: { canalId?: string; eventId?: string }, text: string) => {
      const draft: Draft = { id: requestId(), ...anchor, text: text.trim() };
      setItems((list) => [...list, { state: 'sending', draft, comment: shown(draft, reader) }]);
      void send(draft);
    },
    [reader, send],
  );

  /** Sends a comment that was not taken again, under the same id and with the same words. */
  const retry = useCallback(
    (id: string) => {
      const item = items.find((i) => i.comment.id === id);
      if (!item || item.state !== 'failed') return;
      setItems((list) => list.map((i) => (i.comment.id === id ? { ...item, state: 'sending', error: undefined } : i)));
      void send(item.draft);
    },
    [items, send],
  );

  /** Drops a comment that was not taken, giving its words back to the writer. */
  const drop = useCallback(
    (id: string): string => {
      const item = items.find((i) => i.comment.id === id);
      if (!item || item.state === 'stored') return '';
      setItems((list) => list.filter((i) => i.comment.id !== id));
      return item.draft.text;
    },
    [items],
  );

  return { items, add, retry, drop };
}
