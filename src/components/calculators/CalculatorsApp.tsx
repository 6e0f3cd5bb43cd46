import { useEffect, useState, type ComponentType } from 'react';
import { registerServiceWorker } from '../../lib/client/pwa';
import { IsoSizes } from './IsoSizes';
import { StepBack } from './StepBack';
import { Thirds } from './Thirds';
import { ToothNumbers } from './ToothNumbers';
import { WorkingLength } from './WorkingLength';

const CALCULATORS: readonly { hash: string; label: string; Body: ComponentType }[] = [
  { hash: 'working-length', label: 'Working length', Body: WorkingLength },
  { hash: 'step-back', label: 'Step-back', Body: StepBack },
  { hash: 'thirds', label: 'Canal thirds', Body: Thirds },
  { hash: 'iso-sizes', label: 'ISO sizes', Body: IsoSizes },
  { hash: 'tooth-numbers', label: 'Tooth numbers', Body: ToothNumbers },
];

const fromHash = () => CALCULATORS.find((c) => `#${c.hash}` === window.location.hash) ?? CALCULATORS[0]!;

/**
 * The calculators island: one calculator at a time, chosen by the page's address (#step-back),
 * so each can be linked to and the back button works. Everything is computed by the rules
 * core in the browser; nothing is sent or stored. Registers the service worker, so the page
 * opens offline after one visit, and offers a reload when a new version waits.
 */
export default function CalculatorsApp() {
  const [current, setCurrent] = useState(fromHash);
  const [update, setUpdate] = useState<null | (() => void)>(null);
  useEffect(() => {
    const onHash = () => setCurrent(fromHash());
    window.addEventListener('hashchange', onHash);
    registerServiceWorker((accept) => setUpdate(() => accept));
    return () => window.removeEventListener('hashchange', onHash);
  }, []);
  const { Body } = current;
  return (
    <div data-testid="calculators">
      {update && (
        <div className="bg-note text-white px-4 py-2 mb-3 rounded-lg flex items-center gap-4" role="status">
          <p className="text-lg">A new version of Coneline is ready.</p>
          <button
            type="button"
            onClick={update}
            className="min-h-14 min-w-14 px-4 rounded-lg border-2 border-white font-bold"
          >
            Reload
          </button>
        </div>
      )}
      <nav aria-label="Calculators">
        <ul className="flex flex-wrap gap-2">
          {CALCULATORS.map((c) => (
            <li key={c.hash}>
              <a
                href={`#${c.hash}`}
                aria-current={c === current ? 'true' : undefined}
                className={`inline-flex items-center min-h-14 min-w-14 px-4 rounded-lg border-2 text-lg font-bold no-underline ${
                  c === current ? 'bg-ink text-white border-ink ring-4 ring-gutta' : 'bg-white text-ink border-ink'
                }`}
              >
                {c.label}
              </a>
            </li>
          ))}
        </ul>
      </nav>
      <section
        aria-labelledby="calculator-title"
        className="mt-3 bg-white rounded-2xl border-2 border-gutta p-3 shadow-sm"
        data-calculator={current.hash}
      >
        <h2 id="calculator-title" className="text-2xl font-bold mb-2">
          {current.label}
        </h2>
        <Body key={current.hash} />
      </section>
    </div>
  );
}
