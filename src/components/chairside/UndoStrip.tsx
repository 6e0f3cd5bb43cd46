import { useEffect } from 'react';
import { useChairside } from '../../lib/client/store';

const UNDO_MS = 5000;

/** "Saved — spreader 17.0 mm · Undo", for about five seconds after each tap. */
export function UndoStrip() {
  const undo = useChairside((s) => s.undo);
  const last = useChairside((s) => s.last);
  const saved = useChairside((s) => s.saved);
  const undoLast = useChairside((s) => s.undoLast);
  const clearUndo = useChairside((s) => s.clearUndo);
  useEffect(() => {
    if (!undo) return;
    const t = setTimeout(clearUndo, UNDO_MS);
    return () => clearTimeout(t);
  }, [undo, clearUndo]);
  const value = undo && last && last.eventId === undo.eventId && last.value.endsWith('mm') ? ` ${last.value}` : '';
  return (
    <div
      role="status"
      aria-live="polite"
      data-testid="undo-strip"
      data-saved={saved}
      className={`fixed bottom-0 inset-x-0 z-20 px-4 py-2 flex items-center gap-4 bg-ink text-white ${undo ? '' : 'hidden'}`}
    >
      {undo && (
        <>
          <p className="text-lg" data-testid="saved-text">
            <span className="font-bold">{undo.finishedCanal ? 'Done' : 'Saved'}</span> — {undo.label}
            {value}
          </p>
          <button
            type="button"
            onClick={() => void undoLast()}
            data-testid="undo"
            className="ml-auto min-h-14 min-w-16 px-5 rounded-lg border-2 border-white bg-ink text-white text-lg font-bold"
          >
            Undo
          </button>
        </>
      )}
    </div>
  );
}
