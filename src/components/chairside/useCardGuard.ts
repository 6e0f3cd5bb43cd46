import { useLayoutEffect, useRef, useState, type MouseEvent } from 'react';
import { CardWindow, TAP_GUARD_MS } from '../../lib/client/tapGuard';

/**
 * Ignores taps for TAP_GUARD_MS after `cardKey` changes (a gloved double tap's second tap
 * lands on the new card). Put `onClickCapture` on the element around the card and what moves
 * with it; `armed` turns true once taps count again (tests and the benchmark wait for it).
 */
export function useCardGuard(cardKey: string): {
  armed: boolean;
  onClickCapture: (e: MouseEvent) => void;
} {
  const win = useRef<CardWindow | null>(null);
  const [armedKey, setArmedKey] = useState<string | null>(null);
  useLayoutEffect(() => {
    win.current ??= new CardWindow();
    win.current.show(cardKey, performance.now());
    const t = setTimeout(() => setArmedKey(cardKey), TAP_GUARD_MS);
    return () => clearTimeout(t);
  }, [cardKey]);
  return {
    armed: armedKey === cardKey,
    onClickCapture: (e) => {
      // The tap's own time: one made just before the card changed, but handled after, is ignored too.
      if (win.current && !win.current.accepts(e.timeStamp || performance.now())) {
        e.preventDefault();
        e.stopPropagation();
      }
    },
  };
}
