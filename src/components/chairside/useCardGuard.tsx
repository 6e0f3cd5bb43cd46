import { useLayoutEffect, useRef, useState, type MouseEvent, type ReactNode } from 'react';
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

/**
 * A screen whose taps are guarded like a card's: for TAP_GUARD_MS after it appears or after
 * `screen` changes (the open-case steps, the canal set-up, the finishing card), taps are
 * ignored. `data-armed` says when they count again.
 */
export function Guarded(props: { screen: string; children: ReactNode }) {
  const guard = useCardGuard(props.screen);
  return (
    <div data-testid="screen" data-screen={props.screen} data-armed={guard.armed} onClickCapture={guard.onClickCapture}>
      {props.children}
    </div>
  );
}
