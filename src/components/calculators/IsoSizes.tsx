import { useState } from 'react';
import { ISO_CUTTING_LENGTH_MM, ISO_SIZES, isoSizeRow } from '../../lib/rules/core';
import { IsoBadge, IsoChip } from '../shared/IsoChip';
import { Sources } from './Sources';

const diameter = (mm: number) => `${mm.toFixed(2)} mm`;

/** ISO sizes: a size's colour and its diameters at the tip (D0) and 16 mm up (D16). */
export function IsoSizes() {
  const [size, setSize] = useState('30');
  const row = isoSizeRow(size);
  const rows = ISO_SIZES.map(isoSizeRow).filter((r) => r !== null);
  return (
    <>
      {row && (
        <div className="rounded-xl border-2 border-ink bg-white p-3" data-testid="iso-result" aria-live="polite">
          <p className="flex flex-wrap items-center gap-4">
            <span
              className="inline-flex items-center justify-center min-w-24 min-h-16 px-3 rounded-lg border-2 border-muted text-4xl font-bold tabular"
              style={{ background: row.hex, color: row.textHex }}
            >
              {row.size}
            </span>
            <span className="text-3xl font-bold" data-testid="iso-colour">
              {row.colour}
            </span>
          </p>
          <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-lg">
            <dt>Tip diameter, D0</dt>
            <dd className="text-2xl font-bold tabular whitespace-nowrap" data-testid="iso-d0">
              {diameter(row.d0Mm)}
            </dd>
            <dt>Diameter {ISO_CUTTING_LENGTH_MM} mm from the tip, D16</dt>
            <dd className="text-2xl font-bold tabular whitespace-nowrap" data-testid="iso-d16">
              {diameter(row.d16Mm)}
            </dd>
          </dl>
          <p className="text-base text-muted tabular">
            D16 = D0 + 0.02 × {ISO_CUTTING_LENGTH_MM} = {row.d0Mm.toFixed(2)} +{' '}
            {(0.02 * ISO_CUTTING_LENGTH_MM).toFixed(2)} mm, with the standard taper.
          </p>
        </div>
      )}
      <fieldset className="mt-3 mb-3">
        <legend className="text-base font-bold mb-1">Size</legend>
        <div className="flex flex-wrap gap-2">
          {ISO_SIZES.map((s) => (
            <IsoChip key={s} size={s} selected={s === size} onTap={() => setSize(s)} testId={`iso-${s}`} />
          ))}
        </div>
      </fieldset>
      <div className="overflow-x-auto">
        <table className="text-base border-collapse bg-white">
          <caption className="text-left text-lg font-bold mb-1">All ISO sizes</caption>
          <thead>
            <tr className="border-b-2 border-ink text-left">
              <th scope="col" className="py-1 pr-6">
                Size
              </th>
              <th scope="col" className="py-1 pr-6">
                Colour
              </th>
              <th scope="col" className="py-1 pr-6">
                D0
              </th>
              <th scope="col" className="py-1 pr-6">
                D16
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.size} className="border-b border-line">
                <th scope="row" className="py-1 pr-6 text-left">
                  <IsoBadge size={r.size} />
                </th>
                <td className="py-1 pr-6">{r.colour}</td>
                <td className="py-1 pr-6 tabular">{diameter(r.d0Mm)}</td>
                <td className="py-1 pr-6 tabular">{diameter(r.d16Mm)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <Sources id="iso-sizes" />
    </>
  );
}
