import { useState } from 'react';
import {
  APEX_LOCATOR_BACK_OFF_MM,
  resorptionAllowanceMm,
  RESORPTIONS,
  workingLengthByDiscrepancy,
  workingLengthByProportion,
  workingLengthFromApexLocator,
  type Resorption,
} from '../../lib/rules/core';
import { mmValue } from '../../lib/present/format';
import { Chip, ChipGroup } from '../chairside/AnswerButtons';
import { LengthInput } from './LengthInput';
import { exact, Result } from './Result';
import { Sources } from './Sources';

const RESORPTION_WORDS: Record<Resorption, string> = {
  none: 'None',
  bone: 'Bone',
  'bone-and-root': 'Bone and root',
};

function ResorptionChips(props: { value: Resorption; onChange: (r: Resorption) => void }) {
  return (
    <ChipGroup label="Resorption at the apex on the radiograph">
      {RESORPTIONS.map((r) => (
        <Chip key={r} selected={props.value === r} onTap={() => props.onChange(r)}>
          {RESORPTION_WORDS[r]} ({mmValue(resorptionAllowanceMm(r))} mm short)
        </Chip>
      ))}
    </ChipGroup>
  );
}

/** Radiographic (discrepancy) method: file length plus the file tip's distance to the apex. */
export function Discrepancy() {
  const [file, setFile] = useState(22);
  const [beyond, setBeyond] = useState(false);
  const [distance, setDistance] = useState(2);
  const [resorption, setResorption] = useState<Resorption>('none');
  const tipToApex = beyond ? -distance : distance;
  const r = workingLengthByDiscrepancy(file, tipToApex, resorption);
  const allowance = resorptionAllowanceMm(resorption);
  return (
    <>
      <Result label="Working length" mm={r.workingLengthMm} testId="discrepancy-result">
        {mmValue(file)} {beyond ? '−' : '+'} {mmValue(distance)} = {exact(r.actualLengthMm)} mm actual length;{' '}
        {exact(r.actualLengthMm)} − {mmValue(allowance)} = {exact(r.workingLengthMm)} mm
      </Result>
      <LengthInput label="File length" value={file} onChange={setFile} testId="discrepancy-file" />
      <ChipGroup label="The file tip on the radiograph is">
        <Chip selected={!beyond} onTap={() => setBeyond(false)}>
          Short of the apex
        </Chip>
        <Chip selected={beyond} onTap={() => setBeyond(true)}>
          Beyond the apex
        </Chip>
      </ChipGroup>
      <LengthInput
        label="File tip to the radiographic apex"
        value={distance}
        onChange={setDistance}
        min={0}
        max={10}
        testId="discrepancy-distance"
      />
      <ResorptionChips value={resorption} onChange={setResorption} />
      <Sources id="discrepancy" />
    </>
  );
}

const BACK_OFFS = [APEX_LOCATOR_BACK_OFF_MM.min, APEX_LOCATOR_BACK_OFF_MM.max];

/** Electronic apex locator: the reading less 0.5–1.0 mm. */
export function ApexLocator() {
  const [reading, setReading] = useState(22);
  const [backOff, setBackOff] = useState<number>(APEX_LOCATOR_BACK_OFF_MM.min);
  const wl = workingLengthFromApexLocator(reading, backOff);
  return (
    <>
      <Result label="Working length" mm={wl} testId="apex-locator-result">
        {mmValue(reading)} − {mmValue(backOff)} = {exact(wl)} mm
      </Result>
      <LengthInput label="Apex locator reading" value={reading} onChange={setReading} testId="apex-locator-reading" />
      <ChipGroup label="Back off from the reading">
        {BACK_OFFS.map((b) => (
          <Chip key={b} selected={backOff === b} onTap={() => setBackOff(b)}>
            {mmValue(b)} mm
          </Chip>
        ))}
      </ChipGroup>
      <Sources id="apex-locator" />
    </>
  );
}

/** Proportional method: the file's real length scaled by the tooth and file lengths on the radiograph. */
export function Proportional() {
  const [file, setFile] = useState(20);
  const [radTooth, setRadTooth] = useState(25);
  const [radFile, setRadFile] = useState(22);
  const [resorption, setResorption] = useState<Resorption>('none');
  const r = workingLengthByProportion(file, radTooth, radFile, resorption);
  return (
    <>
      <Result label="Working length" mm={r.workingLengthMm} testId="proportional-result">
        {mmValue(file)} × {mmValue(radTooth)} ÷ {mmValue(radFile)} = {exact(r.actualLengthMm)} mm actual length;{' '}
        {exact(r.actualLengthMm)} − {mmValue(resorptionAllowanceMm(resorption))} = {exact(r.workingLengthMm)} mm
      </Result>
      <Result label="Actual tooth length" mm={r.actualLengthMm} testId="proportional-actual" minor />
      <LengthInput label="Real file length" value={file} onChange={setFile} testId="proportional-file" />
      <LengthInput
        label="Tooth length on the radiograph"
        value={radTooth}
        onChange={setRadTooth}
        max={60}
        testId="proportional-radiograph-tooth"
      />
      <LengthInput
        label="File length on the radiograph"
        value={radFile}
        onChange={setRadFile}
        max={60}
        testId="proportional-radiograph-file"
      />
      <ResorptionChips value={resorption} onChange={setResorption} />
      <Sources id="proportional" />
    </>
  );
}

const METHODS = [
  { id: 'discrepancy', label: 'Radiograph', title: 'Radiographic (discrepancy) method', Body: Discrepancy },
  { id: 'apex-locator', label: 'Apex locator', title: 'Electronic apex locator', Body: ApexLocator },
  { id: 'proportional', label: 'Proportion', title: "Proportional (Grossman's) method", Body: Proportional },
] as const;

/** Working length by three methods, one at a time. */
export function WorkingLength() {
  const [method, setMethod] = useState<(typeof METHODS)[number]['id']>('discrepancy');
  const m = METHODS.find((x) => x.id === method) ?? METHODS[0];
  return (
    <>
      <ChipGroup label="Method">
        {METHODS.map((x) => (
          <Chip key={x.id} selected={x.id === method} onTap={() => setMethod(x.id)} testId={`method-${x.id}`}>
            {x.label}
          </Chip>
        ))}
      </ChipGroup>
      <h3 className="text-xl font-bold mb-2">{m.title}</h3>
      <m.Body key={m.id} />
    </>
  );
}
