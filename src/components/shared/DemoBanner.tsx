/**
 * One slim line on every page while the installation holds the invented demo clinic, so
 * nobody mistakes it for a real install. Rendered to static HTML by the server pages and
 * inside the chairside island's top bar; white on gutta-strong is 5.0:1 (WCAG AA).
 */
export function DemoBanner() {
  return (
    <p data-testid="demo-banner" className="bg-gutta-strong text-white text-sm leading-5 px-3 py-0.5 text-center">
      <strong>Demo clinic</strong>: invented people and data, not for patient records.
    </p>
  );
}
