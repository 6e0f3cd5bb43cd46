import { useState } from 'react';
import { canalThirds, DEFAULT_TOLERANCES, fallbackStopDepthFor, floorToHalf } from '../../lib/rules/core';
import { mmValue } from '../../lib/present/format';
import { Chip, ChipGroup } from '../chairside/AnswerButtons';
import { LengthInput } from './LengthInput';
import { exact } from './Result';
import { Sources } from './Sources';

/** A boundary depth rounded down to the ruler step, with the exact value when they differ. */
function Depth({ mm }: { mm: number }) {
  const shown = floorToHalf(mm);
  return (
    <span className="tabular" data-mm={shown}>
      <strong className="text-2xl">{mmValue(shown)}</strong>
      {Math.abs(shown - mm) > 0.004 && <span className="text-muted"> (exact {exact(mm)})</span>}
    </span>
  );
}

// For an estimated orifice: the rules core scales the stop depth on anterior teeth by their
// average length (fallbackStopDepthFor); the left side's averages are the right side's.
const TEETH = [
  { fdi: undefined, words: 'Premolar or molar' },
  { fdi: 11, words: 'Upper central incisor' },
  { fdi: 12, words: 'Upper lateral incisor' },
  { fdi: 13, words: 'Upper canine' },
  { fdi: 41, words: 'Lower central incisor' },
  { fdi: 42, words: 'Lower lateral incisor' },
  { fdi: 43, words: 'Lower canine' },
] as const;

/** The thirds of a canal from its orifice to the CWL, and the depth at which compaction is complete. */
export function Thirds() {
  const [cwl, setCwl] = useState(21);
  const [measured, setMeasured] = useState(true);
  const [orifice, setOrifice] = useState(9);
  const [tooth, setTooth] = useState<number | undefined>(undefined);
  const s = DEFAULT_TOLERANCES.fallbackStopDepthMm;
  const stopDepth = fallbackStopDepthFor(tooth, s);
  const t = canalThirds(cwl, measured ? Math.min(orifice, cwl) : undefined, s, tooth);
  const rows = [
    { name: 'Coronal third', from: t.orificeMm, to: t.coronalEndMm },
    { name: 'Middle third', from: t.coronalEndMm, to: t.middleEndMm },
    { name: 'Apical third', from: t.middleEndMm, to: t.cwlMm },
  ];
  return (
    <>
      <div className="rounded-xl border-2 border-ink bg-white p-3" data-testid="thirds-result" aria-live="polite">
        <p className="text-lg font-bold">Lateral compaction is complete once the spreader stops at</p>
        <p className="text-5xl font-bold tabular" data-testid="thirds-complete" data-mm={floorToHalf(t.coronalEndMm)}>
          {mmValue(floorToHalf(t.coronalEndMm))} mm or less
        </p>
        <p className="text-base text-muted tabular">
          the end of the coronal third: {exact(t.orificeMm)} + ({exact(t.cwlMm)} − {exact(t.orificeMm)}) ÷ 3 ={' '}
          {exact(t.coronalEndMm)} mm, rounded down to the 0.5 mm step
          {t.estimated && `; orifice estimated from a stop depth of ${exact(stopDepth)} mm`}
        </p>
        <table className="mt-2 text-lg border-collapse">
          <caption className="sr-only">Canal thirds, depths from the reference point in mm</caption>
          <thead>
            <tr className="border-b-2 border-ink text-left">
              <th scope="col" className="py-1 pr-6">
                Third
              </th>
              <th scope="col" className="py-1 pr-6">
                From (mm)
              </th>
              <th scope="col" className="py-1 pr-6">
                To (mm)
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.name} className="border-b border-line">
                <th scope="row" className="py-1 pr-6 text-left font-normal">
                  {r.name}
                </th>
                <td className="py-1 pr-6">
                  <Depth mm={r.from} />
                </td>
                <td className="py-1 pr-6">
                  <Depth mm={r.to} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        {t.estimated && (
          <p className="text-base mt-2">
            Orifice depth estimated: <strong className="tabular">{mmValue(floorToHalf(t.orificeMm))} mm</strong>, from
            the usual stop depth of {mmValue(s)} mm{tooth !== undefined && ", scaled by the tooth's average length"}.
            Your clinic may set another stop depth; the chairside uses the clinic&apos;s.
          </p>
        )}
      </div>
      <LengthInput label="CWL" value={cwl} onChange={setCwl} testId="thirds-cwl" />
      <ChipGroup label="Orifice depth from the reference point">
        <Chip selected={measured} onTap={() => setMeasured(true)}>
          Measured
        </Chip>
        <Chip selected={!measured} onTap={() => setMeasured(false)}>
          Not measured
        </Chip>
      </ChipGroup>
      {!measured && (
        <ChipGroup label="Tooth">
          {TEETH.map((x) => (
            <Chip key={x.words} selected={tooth === x.fdi} onTap={() => setTooth(x.fdi)}>
              {x.words}
            </Chip>
          ))}
        </ChipGroup>
      )}
      {measured && (
        <LengthInput
          label="Orifice depth"
          value={orifice}
          onChange={setOrifice}
          min={0}
          max={40}
          testId="thirds-orifice"
        />
      )}
      <Sources id="thirds" />
    </>
  );
}
