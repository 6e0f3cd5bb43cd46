import { useState } from 'react';
import { fdiToUniversal, toothName, universalToFdi } from '../../lib/rules/core';
import { Chip, ChipGroup } from '../chairside/AnswerButtons';
import { Sources } from './Sources';

const QUADRANTS = [
  { q: 1, words: 'upper right' },
  { q: 2, words: 'upper left' },
  { q: 3, words: 'lower left' },
  { q: 4, words: 'lower right' },
] as const;

const range = (from: number, to: number) => Array.from({ length: to - from + 1 }, (_, i) => from + i);
const letters = (from: string, to: string) =>
  range(from.charCodeAt(0), to.charCodeAt(0)).map((c) => String.fromCharCode(c));

/** FDI and Universal, each way round, for permanent and primary teeth. */
export function ToothNumbers() {
  const [from, setFrom] = useState<'fdi' | 'universal'>('fdi');
  const [primary, setPrimary] = useState(false);
  const [quadrant, setQuadrant] = useState(3);
  const [tooth, setTooth] = useState(6);
  const [universal, setUniversal] = useState<string>('19');

  const fdi = from === 'fdi' ? (primary ? quadrant + 4 : quadrant) * 10 + tooth : universalToFdi(universal);
  const u = from === 'fdi' ? fdiToUniversal(fdi ?? 0) : universal;
  const chooseTooth = (isPrimary: boolean) => {
    setPrimary(isPrimary);
    if (isPrimary && tooth > 5) setTooth(5);
  };
  const pick = (value: string) => (
    <Chip key={value} selected={universal === value} onTap={() => setUniversal(value)} testId={`universal-${value}`}>
      {value}
    </Chip>
  );
  return (
    <>
      <div className="rounded-xl border-2 border-ink bg-white p-3" data-testid="tooth-result" aria-live="polite">
        {fdi !== null && u !== '' ? (
          <>
            <p className="flex flex-wrap items-baseline gap-x-6 text-2xl">
              <span>
                FDI{' '}
                <strong className="text-5xl tabular" data-testid="tooth-fdi">
                  {fdi}
                </strong>
              </span>
              <span>
                Universal{' '}
                <strong className="text-5xl tabular" data-testid="tooth-universal">
                  {u}
                </strong>
              </span>
            </p>
            <p className="text-lg mt-1">{toothName(fdi)}</p>
          </>
        ) : (
          <p className="text-2xl font-bold">— Pick a tooth.</p>
        )}
      </div>
      <ChipGroup label="Convert from">
        <Chip selected={from === 'fdi'} onTap={() => setFrom('fdi')} testId="from-fdi">
          FDI
        </Chip>
        <Chip selected={from === 'universal'} onTap={() => setFrom('universal')} testId="from-universal">
          Universal
        </Chip>
      </ChipGroup>
      {from === 'fdi' ? (
        <>
          <ChipGroup label="Teeth">
            <Chip selected={!primary} onTap={() => chooseTooth(false)}>
              Permanent
            </Chip>
            <Chip selected={primary} onTap={() => chooseTooth(true)}>
              Primary
            </Chip>
          </ChipGroup>
          <ChipGroup label="Quadrant (the patient's side)">
            {QUADRANTS.map(({ q, words }) => (
              <Chip key={q} selected={quadrant === q} onTap={() => setQuadrant(q)} testId={`fdi-quadrant-${q}`}>
                {primary ? q + 4 : q} {words}
              </Chip>
            ))}
          </ChipGroup>
          <ChipGroup label="Tooth, from the midline">
            {range(1, primary ? 5 : 8).map((t) => (
              <Chip key={t} selected={tooth === t} onTap={() => setTooth(t)} testId={`fdi-tooth-${t}`}>
                {t}
              </Chip>
            ))}
          </ChipGroup>
        </>
      ) : (
        <>
          <ChipGroup label="Upper permanent teeth, from the patient's right">
            {range(1, 16).map(String).map(pick)}
          </ChipGroup>
          <ChipGroup label="Lower permanent teeth, from the patient's left">
            {range(17, 32).map(String).map(pick)}
          </ChipGroup>
          <ChipGroup label="Upper primary teeth, from the patient's right">{letters('A', 'J').map(pick)}</ChipGroup>
          <ChipGroup label="Lower primary teeth, from the patient's left">{letters('K', 'T').map(pick)}</ChipGroup>
        </>
      )}
      <Sources id="tooth-numbers" />
    </>
  );
}
