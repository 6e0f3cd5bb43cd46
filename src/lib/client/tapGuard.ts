/**
 * Gloved double taps. A gloved finger often taps twice, 100–200 ms apart: the second tap
 * lands on whatever the first one put in its place (the next card's ruler, say) or records
 * the same answer again. For this long after a card changes its taps are ignored, and the
 * same answer (type and data) within it is recorded once. A deliberate next tap comes later:
 * reading the new card takes longer than this.
 */
export const TAP_GUARD_MS = 400;

/**
 * When the card on screen appeared, so that taps meant for the card before it are ignored.
 * Times are the page's clock (`performance.now()`, the same clock as `Event.timeStamp`).
 */
export class CardWindow {
  private key: string | null = null;
  private shownAt = Number.NEGATIVE_INFINITY;

  /** The card `key` is on screen at `now`; a different key than before restarts the window. */
  show(key: string, now: number): void {
    if (key === this.key) return;
    this.key = key;
    this.shownAt = now;
  }

  /** Whether a tap made at `at` is for this card: not before it appeared, nor within the window after. */
  accepts(at: number): boolean {
    return at - this.shownAt >= TAP_GUARD_MS;
  }
}

/**
 * Whether an answer repeats the one before it within the window, e.g. an instant double tap
 * on "Seats and holds" before the next card could appear. `answer` names what is recorded:
 * where (case, canal), the event type and its data. Keeps the latest answer and its time.
 */
export class RepeatFilter {
  private last: { answer: string; at: number } | null = null;

  /** True when `answer` at `now` is the same as the previous one and within the window. */
  repeats(answer: string, now: number): boolean {
    const again = this.last !== null && this.last.answer === answer && now - this.last.at < TAP_GUARD_MS;
    if (!again) this.last = { answer, at: now };
    return again;
  }
}
