import { useRef, useState } from 'react';
import { averageLengthMm, ISO_SIZES, referencePointsFor } from '../../lib/rules/core';
import { canalTitle, preparationLabel } from '../../lib/present/labels';
import { newId } from '../../lib/client/ids';
import { clampLength } from '../../lib/client/flow';
import { useChairside } from '../../lib/client/store';
import type { Setting } from '../../lib/client/derive';
import { IsoChip } from '../shared/IsoChip';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';
import { CONE_DESIGNATIONS } from './cardTypes';
import { SEALERS } from './StepCardsPrep';

const MAF_SIZES = ISO_SIZES.filter((s) => Number(s) >= 15 && Number(s) <= 60);
const PREPARATIONS = (['step-back', '0.04', '0.06'] as const).map((k) => [k, preparationLabel(k)] as const);
const CONE_SIZES = [...CONE_DESIGNATIONS, '20', '25'];

/** One card per canal: reference point, CWL, MAF, preparation, spreader and cone sizes, sealer, orifice depth. */
export function CanalSetup(props: {
  name: string;
  caseId: string;
  setting: Setting;
  tooth?: number;
  remaining: number;
  onDone: (canalId: string) => void;
  onCancel: () => void;
}) {
  const record = useChairside((s) => s.record);
  const block = props.setting === 'block';
  const points = referencePointsFor(block ? undefined : props.tooth);
  const avg = props.tooth ? averageLengthMm(props.tooth) : null;
  const cwlCentre = block ? 18 : clampLength((avg ?? 21) - 1);
  const [referencePoint, setReferencePoint] = useState(points[0] ?? 'other');
  const [otherPoint, setOtherPoint] = useState('');
  const [cwl, setCwl] = useState<number | undefined>();
  const [maf, setMaf] = useState<string | undefined>();
  const [preparation, setPreparation] = useState('step-back');
  const [spreader, setSpreader] = useState('MF');
  const [accessory, setAccessory] = useState('MF');
  const [sealer, setSealer] = useState<(typeof SEALERS)[number][0]>('epoxy-resin');
  const [orifice, setOrifice] = useState<number | undefined>(block ? 0 : undefined);

  const refText = referencePoint === 'other' ? otherPoint.trim() : referencePoint;
  const ready = cwl !== undefined && maf !== undefined && refText !== '';
  // One canal per "Save": a second tap while the first is being recorded adds nothing.
  const saving = useRef(false);
  const save = async () => {
    if (!ready || saving.current) return;
    saving.current = true;
    const canalId = newId();
    const data = {
      name: props.name,
      referencePoint: refText,
      cwlMm: cwl,
      mafSize: maf,
      preparation,
      spreader,
      accessorySize: accessory,
      sealer,
      ...(orifice !== undefined ? { orificeDepthMm: orifice } : {}),
    };
    const ev = await record('canal.added', data, {
      canalId,
      label: `${canalTitle(props.name)} set up`,
      value: `CWL ${mm(cwl)} mm`,
    });
    saving.current = false;
    if (ev) props.onDone(canalId);
  };

  return (
    <StepCard
      title={`Set up the ${canalTitle(props.name)}`}
      hint={
        props.remaining > 0
          ? `${props.remaining} more canal${props.remaining === 1 ? '' : 's'} after this one.`
          : undefined
      }
    >
      <ChipGroup label="Reference point">
        {[...points, 'other'].map((p) => (
          <Chip key={p} selected={referencePoint === p} onTap={() => setReferencePoint(p)}>
            {p}
          </Chip>
        ))}
      </ChipGroup>
      {referencePoint === 'other' && (
        <label className="block text-base font-bold mb-3">
          Reference point
          <input
            value={otherPoint}
            maxLength={60}
            onChange={(e) => setOtherPoint(e.target.value)}
            className="block min-h-14 w-full max-w-sm px-3 text-xl border-2 border-ink rounded-lg font-normal"
          />
        </label>
      )}
      <RulerStrip
        label="CWL"
        centre={cwlCentre}
        mark={
          block
            ? { mm: cwlCentre, word: 'typical', meaning: 'a typical training-block length' }
            : { mm: cwlCentre, word: 'avg − 1', meaning: 'the textbook average length less 1 mm' }
        }
        selected={cwl}
        onTap={setCwl}
        testId="ruler-cwl"
      />
      <ChipGroup label="MAF size">
        {MAF_SIZES.map((s) => (
          <IsoChip key={s} size={s} selected={maf === s} onTap={() => setMaf(s)} testId={`maf-${s}`} />
        ))}
      </ChipGroup>
      <ChipGroup label="Preparation">
        {PREPARATIONS.map(([k, l]) => (
          <Chip key={k} selected={preparation === k} onTap={() => setPreparation(k)}>
            {l}
          </Chip>
        ))}
      </ChipGroup>
      <ChipGroup label="Spreader">
        {CONE_SIZES.map((s) => (
          <IsoChip key={s} size={s} selected={spreader === s} onTap={() => setSpreader(s)} testId={`spreader-${s}`} />
        ))}
      </ChipGroup>
      <ChipGroup label="Accessory cones">
        {CONE_SIZES.map((s) => (
          <IsoChip
            key={s}
            size={s}
            selected={accessory === s}
            onTap={() => setAccessory(s)}
            testId={`accessory-${s}`}
          />
        ))}
      </ChipGroup>
      <ChipGroup label="Sealer">
        {SEALERS.map(([k, l]) => (
          <Chip key={k} selected={sealer === k} onTap={() => setSealer(k)}>
            {l}
          </Chip>
        ))}
      </ChipGroup>
      {!block && (
        <RulerStrip
          label="Orifice depth (optional)"
          centre={7}
          selected={orifice}
          min={0}
          max={20}
          onTap={(v) => setOrifice(orifice === v ? undefined : v)}
          testId="ruler-orifice"
        />
      )}
      <Answers>
        <Answer tone="primary" disabled={!ready} onTap={() => void save()} testId="save-canal">
          Save the {canalTitle(props.name)}
        </Answer>
        <Answer onTap={props.onCancel}>Cancel</Answer>
      </Answers>
    </StepCard>
  );
}
