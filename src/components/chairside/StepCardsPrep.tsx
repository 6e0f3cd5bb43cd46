import { useState } from 'react';
import { ISO_SIZES } from '../../lib/rules/core';
import { capitalise, SEALER_LABEL } from '../../lib/present/labels';
import { IsoChip } from '../shared/IsoChip';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';
import { mm, RulerStrip } from './RulerStrip';
import { sizesAround, type CardProps } from './cardTypes';

export function SeatCard({ canal, rec }: CardProps) {
  const seat = (result: 'seated' | 'advances' | 'short', label: string) =>
    rec('seat.checked', { fileSize: canal.mafSize, lengthMm: canal.cwlMm, result }, 'seat check', label);
  return (
    <StepCard
      title="Does the MAF seat at the CWL and hold?"
      hint={`MAF ${canal.mafSize} at ${mm(canal.cwlMm)} mm, light apical pressure.`}
    >
      <Answers>
        <Answer tone="primary" onTap={() => seat('seated', 'Seats and holds')}>
          Seats and holds
        </Answer>
        <Answer onTap={() => seat('advances', 'Goes past')}>Goes past</Answer>
        <Answer onTap={() => seat('short', 'Short of length')}>Short of length</Answer>
      </Answers>
    </StepCard>
  );
}

export function TaperCard({ canal, rec, centre }: CardProps & { centre: number }) {
  const spreader = canal.spreader ?? 'MF';
  return (
    <StepCard
      title="Taper check: how deep does the spreader go?"
      hint={`Spreader ${spreader}; it should reach within 1 mm of the CWL (${mm(canal.cwlMm)} mm).`}
    >
      <RulerStrip
        label="Spreader depth"
        centre={centre}
        mark={{ mm: centre, word: 'CWL − 1', meaning: 'the CWL less 1 mm' }}
        onTap={(v) => rec('taper.checked', { spreader, depthMm: v }, 'taper check', `${mm(v)} mm`)}
      />
    </StepCard>
  );
}

const PURPOSE_TITLE = {
  maf: 'MAF radiograph: taken with the MAF in place?',
  'cone-fit': 'Cone-fit radiograph: taken with the master cone in place?',
};

export function RadiographCard({
  rec,
  purpose,
  retake,
}: CardProps & { purpose: 'maf' | 'cone-fit'; retake?: boolean }) {
  return (
    <StepCard
      title={PURPOSE_TITLE[purpose]}
      hint={
        retake
          ? 'The cone was refitted by 1 mm or more: take it again.'
          : 'Attach the image later from the workstation.'
      }
    >
      <Answers>
        <Answer
          tone="primary"
          onTap={() =>
            rec('radiograph.taken', { purpose }, `${purpose === 'maf' ? 'MAF' : 'cone-fit'} radiograph`, 'Taken')
          }
        >
          Taken
        </Answer>
      </Answers>
    </StepCard>
  );
}

const SOLUTIONS = [
  ['naocl', 'NaOCl'],
  ['edta', 'EDTA'],
  ['saline', 'Saline'],
  ['chlorhexidine', 'CHX'],
] as const;
type Solution = (typeof SOLUTIONS)[number][0];

export function RinseCard({ rec }: CardProps) {
  const [picked, setPicked] = useState<Solution[]>(['naocl', 'edta']);
  const toggle = (s: Solution) => setPicked(picked.includes(s) ? picked.filter((x) => x !== s) : [...picked, s]);
  return (
    <StepCard title="Final rinse: which solutions?" hint="Sodium hypochlorite, then EDTA for the smear layer.">
      <ChipGroup label="Solutions">
        {SOLUTIONS.map(([key, label]) => (
          <Chip key={key} selected={picked.includes(key)} onTap={() => toggle(key)}>
            {label}
          </Chip>
        ))}
      </ChipGroup>
      <Answers>
        <Answer
          tone="primary"
          disabled={picked.length === 0}
          onTap={() =>
            rec(
              'canal.rinsed',
              { solutions: picked },
              'final rinse',
              SOLUTIONS.filter(([k]) => picked.includes(k))
                .map(([, l]) => l)
                .join(' + '),
            )
          }
        >
          Done
        </Answer>
      </Answers>
    </StepCard>
  );
}

const POINTS = ['fine', 'medium', 'coarse'] as const;

export function DryCard({ canal, rec, centre }: CardProps & { centre: number }) {
  const [point, setPoint] = useState<(typeof POINTS)[number]>('medium');
  return (
    <StepCard
      title="Dry: paper points measured to what length?"
      hint={`Points must not pass the CWL (${mm(canal.cwlMm)} mm).`}
    >
      <ChipGroup label="Paper point size">
        {POINTS.map((p) => (
          <Chip key={p} selected={point === p} onTap={() => setPoint(p)}>
            {p}
          </Chip>
        ))}
      </ChipGroup>
      <RulerStrip
        label="Paper point length"
        centre={centre}
        mark={{ mm: centre, word: 'CWL', meaning: 'the CWL' }}
        onTap={(v) => rec('canal.dried', { pointSize: point, measuredMm: v }, 'paper points', `${mm(v)} mm`)}
      />
    </StepCard>
  );
}

export function MasterCard({ canal, rec, centre, refit }: CardProps & { centre: number; refit: boolean }) {
  const [size, setSize] = useState(canal.mafSize);
  const [length, setLength] = useState<number | undefined>();
  const [tugBack, setTugBack] = useState<boolean | undefined>();
  const fit = (reachedLength: boolean) => {
    if (length === undefined) return;
    const data = { size, lengthMm: length, reachedLength, ...(tugBack !== undefined ? { tugBack } : {}) };
    void rec('master.fitted', data, `master cone ${size}${reachedLength ? '' : ' (short)'}`, `${mm(length)} mm`);
  };
  return (
    <StepCard
      title={refit ? 'Fit a master cone again: size and length?' : 'Master cone: size and length, did it reach?'}
      hint={`Mark it at the reference point; the CWL is ${mm(canal.cwlMm)} mm.`}
    >
      <ChipGroup label="Cone size">
        {sizesAround(canal.mafSize, ISO_SIZES).map((s) => (
          <IsoChip key={s} size={s} selected={size === s} onTap={() => setSize(s)} />
        ))}
      </ChipGroup>
      <RulerStrip
        label="Cone length"
        centre={centre}
        mark={{ mm: centre, word: 'CWL', meaning: 'the CWL' }}
        selected={length}
        onTap={setLength}
        testId="ruler-master"
      />
      {/* Tug-back beside the answers: one row less, so the answers stay on screen upright and sideways. */}
      <div className="flex flex-wrap items-end gap-x-6">
        <ChipGroup label="Tug-back (optional)">
          <Chip selected={tugBack === true} onTap={() => setTugBack(tugBack === true ? undefined : true)}>
            Yes
          </Chip>
          <Chip selected={tugBack === false} onTap={() => setTugBack(tugBack === false ? undefined : false)}>
            No
          </Chip>
        </ChipGroup>
        <div className="mb-2">
          <Answers>
            <Answer tone="primary" disabled={length === undefined} onTap={() => fit(true)}>
              Reached
            </Answer>
            <Answer tone="warn" disabled={length === undefined} onTap={() => fit(false)}>
              Short
            </Answer>
          </Answers>
        </div>
      </div>
    </StepCard>
  );
}

/** The sealers as chips, the usual one first. */
export const SEALERS = (['epoxy-resin', 'zoe', 'calcium-silicate', 'calcium-hydroxide', 'other'] as const).map(
  (k) => [k, capitalise(SEALER_LABEL[k])] as const,
);

type Sealer = (typeof SEALERS)[number][0];
const isSealer = (s: string | undefined): s is Sealer => SEALERS.some(([k]) => k === s);

export function SealCard({ canal, rec }: CardProps) {
  const [sealer, setSealer] = useState<Sealer>(isSealer(canal.sealer) ? canal.sealer : 'epoxy-resin');
  return (
    <StepCard title="Coat the master cone with sealer and seat it" hint="Tap Seated once it is at length.">
      <ChipGroup label="Sealer">
        {SEALERS.map(([k, l]) => (
          <Chip key={k} selected={sealer === k} onTap={() => setSealer(k)}>
            {l}
          </Chip>
        ))}
      </ChipGroup>
      <Answers>
        <Answer tone="primary" onTap={() => rec('master.seated', { sealer }, 'master cone seated', 'Seated')}>
          Seated
        </Answer>
      </Answers>
    </StepCard>
  );
}
