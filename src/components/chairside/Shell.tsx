import { SAFETY_LINE } from '../../lib/rules/core';

/** The Coneline mark: the word in bold, a short line under "cone" (a cone on its length line). */
export function ConelineMark() {
  return (
    <span className="font-bold text-2xl tracking-tight shrink-0" role="img" aria-label="Coneline">
      <span className="border-b-4 border-gutta pb-0.5" aria-hidden="true">
        Cone
      </span>
      <span aria-hidden="true">line</span>
    </span>
  );
}

/** Every screen's top bar is one row of this height (56 px controls with 8 px above and below). */
export const BAR_ROW = 'px-3 py-2 min-h-18 flex flex-wrap sm:flex-nowrap items-center gap-2';

/** The safety line, under the top bar on every chairside screen, where checks show. */
export function SafetyNote() {
  return (
    <p className="px-3 py-1 text-sm text-muted border-b border-line bg-paper" data-testid="safety-line">
      {SAFETY_LINE}
    </p>
  );
}

/** The element holding the static shell, which the island removes once its first screen is up. */
export const SHELL_ID = 'chairside-shell';

/**
 * What /chairside shows before its script has run and while the island opens the tablet's
 * log: the top bar, the safety line and a card sized like the first screen, saying the cases
 * are loading. Rendered to HTML at build time only (src/pages/chairside.astro): no JavaScript.
 * The island removes it in the frame its first screen appears, so nothing moves.
 */
export function Shell() {
  return (
    <div id={SHELL_ID} className="min-h-screen flex flex-col" aria-busy="true">
      <header className="bg-white border-b-2 border-line">
        <div className={BAR_ROW}>
          <ConelineMark />
        </div>
      </header>
      <SafetyNote />
      <main id="main" className="flex-1 p-3">
        <section className="bg-white rounded-2xl border-2 border-line p-4 min-h-44" aria-labelledby="loading-title">
          <h2 id="loading-title" className="text-2xl font-bold mb-1">
            Loading your cases…
          </h2>
          <p className="text-lg text-muted mb-3">
            The log on this tablet opens in a moment, with or without a network. What you record is kept here first and
            sent when the network allows.
          </p>
          <div className="h-16 w-56 rounded-xl bg-paper border-2 border-line" aria-hidden="true" />
        </section>
      </main>
    </div>
  );
}
