import type { CanalState } from '../../lib/rules/core';
import { canalTitle } from '../../lib/present/labels';
import { mmValue } from '../../lib/present/format';

/** The parts of a canal's derived state the diagram draws (CanalState from the rules core). */
export type DiagramState = Pick<
  CanalState,
  'name' | 'referencePoint' | 'cwlMm' | 'thirds' | 'masterCone' | 'accessories' | 'spreaderDepths' | 'searLevel'
>;

const W = 340;
const H = 460;
const TOP = 34;
const BOTTOM = 26;
const CX = 150;
const INK = '#17212E';
const GUTTA = '#D9683B';
const GUTTA_STRONG = '#B4521F';
const MUTED = '#4A5566';

const f1 = mmValue;

/**
 * The canal from reference point to CWL: thirds shaded, orifice and CWL marked, the master
 * cone, each accessory cone at its length (removed cones dashed and crossed), spreader
 * depths as ticks on the right, and the sear level. Pure SVG: used chairside and in review.
 */
export function CanalDiagram({ state, caption }: { state: DiagramState; caption?: string }) {
  const cwl = state.cwlMm || 1;
  const { orificeMm, coronalEndMm, middleEndMm, estimated } = state.thirds;
  const k = (H - TOP - BOTTOM) / cwl;
  const y = (mm: number) => TOP + Math.max(0, mm) * k;
  // Canal walls taper from 46 px wide at the orifice to 8 px at the CWL.
  const half = (mm: number) => 4 + (19 * (cwl - mm)) / Math.max(cwl - orificeMm, 1);
  const wall = (side: 1 | -1) => [orificeMm, cwl].map((mm) => `${CX + side * half(mm)},${y(mm)}`).join(' ');
  const canal = `${wall(-1)} ${[...[orificeMm, cwl].map((mm) => `${CX + half(mm)},${y(mm)}`)].reverse().join(' ')}`;

  const kept = state.accessories.filter((a) => !a.removed);
  const removed = state.accessories.filter((a) => a.removed);
  // Kept cones fan out beside the master cone, alternating sides, and meet it at their tips.
  const offset = (i: number) => (i % 2 === 0 ? -1 : 1) * (9 + 5 * Math.floor(i / 2));
  const summary = [
    `${canalTitle(state.name)}: CWL ${f1(cwl)} mm`,
    state.masterCone
      ? `master cone ${state.masterCone.size} at ${f1(state.masterCone.lengthMm)} mm`
      : 'no master cone yet',
    `${kept.length} accessory cone${kept.length === 1 ? '' : 's'} kept`,
    removed.length ? `${removed.length} removed` : '',
    state.spreaderDepths.length ? `spreader depths ${state.spreaderDepths.map(f1).join(', ')} mm` : '',
    state.searLevel ? (state.searLevel.atOrifice ? 'seared at the orifice' : 'seared below the orifice') : '',
  ]
    .filter(Boolean)
    .join('; ');

  return (
    <figure className="m-0">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={summary}
        className="w-full h-auto max-h-[70vh]"
        data-testid="canal-diagram"
      >
        <title>{summary}</title>
        {/* thirds */}
        <rect x={40} y={y(orificeMm)} width={260} height={y(coronalEndMm) - y(orificeMm)} fill="#EFE9DD" />
        <rect x={40} y={y(coronalEndMm)} width={260} height={y(middleEndMm) - y(coronalEndMm)} fill="#F8F6F1" />
        <rect x={40} y={y(middleEndMm)} width={260} height={y(cwl) - y(middleEndMm)} fill="#E4DCCB" />
        {[
          ['coronal', orificeMm, coronalEndMm],
          ['middle', coronalEndMm, middleEndMm],
          ['apical', middleEndMm, cwl],
        ].map(([label, a, b]) => (
          <text key={label as string} x={44} y={(y(a as number) + y(b as number)) / 2 + 4} fontSize="12" fill={MUTED}>
            {label as string}
          </text>
        ))}
        {/* reference point and orifice */}
        <line x1={20} x2={320} y1={TOP} y2={TOP} stroke={INK} strokeWidth="2" />
        <text x={20} y={TOP - 8} fontSize="12" fill={INK}>
          ref: {state.referencePoint}
        </text>
        <line x1={40} x2={300} y1={y(orificeMm)} y2={y(orificeMm)} stroke={MUTED} strokeDasharray="5 4" />
        <text x={302} y={y(orificeMm) + 4} fontSize="11" fill={MUTED}>
          orifice{estimated ? '*' : ''}
        </text>
        <polygon points={canal} fill="#FFFFFF" stroke={INK} strokeWidth="1.5" />
        {/* master cone */}
        {state.masterCone && (
          <polygon
            data-part="master"
            points={`${CX - 7},${y(orificeMm - 2)} ${CX + 7},${y(orificeMm - 2)} ${CX + 2},${y(state.masterCone.lengthMm)} ${CX - 2},${y(state.masterCone.lengthMm)}`}
            fill={GUTTA}
            stroke={GUTTA_STRONG}
          />
        )}
        {/* accessory cones */}
        {kept.map((a, i) => (
          <g key={a.eventId} data-part="accessory">
            <line
              x1={CX + offset(i)}
              x2={CX + offset(i) * 0.35}
              y1={y(orificeMm - 3)}
              y2={y(a.lengthMm)}
              stroke={a.reachedLength ? GUTTA_STRONG : '#B3261E'}
              strokeWidth="3"
              strokeLinecap="round"
            />
            <circle
              cx={CX + offset(i) * 0.35}
              cy={y(a.lengthMm)}
              r="3.5"
              fill={a.reachedLength ? GUTTA_STRONG : '#B3261E'}
            />
            <text
              x={CX - 22}
              y={y(a.lengthMm) + 4}
              fontSize="10"
              textAnchor="end"
              fill={INK}
            >{`A${i + 1} ${f1(a.lengthMm)}${a.reachedLength ? '' : ' short'}`}</text>
          </g>
        ))}
        {removed.map((a, i) => (
          <g key={a.eventId} data-part="removed">
            <line
              x1={CX + 118 + i * 9}
              x2={CX + 118 + i * 9}
              y1={y(orificeMm - 3)}
              y2={y(a.lengthMm)}
              stroke={MUTED}
              strokeWidth="2"
              strokeDasharray="4 3"
            />
            <text x={CX + 113 + i * 9} y={y(a.lengthMm) + 13} fontSize="12" fill={MUTED}>
              ×
            </text>
          </g>
        ))}
        {removed.length > 0 && (
          <text x={CX + 112} y={y(orificeMm - 3) - 4} fontSize="10" fill={MUTED}>
            removed
          </text>
        )}
        {/* spreader depths */}
        {state.spreaderDepths.map((d, i) => (
          <g key={i} data-part="spreader">
            <polygon points={`${CX + 32},${y(d)} ${CX + 42},${y(d) - 5} ${CX + 42},${y(d) + 5}`} fill={INK} />
            <text x={CX + 46} y={y(d) + 4} fontSize="11" fill={INK}>{`S${i + 1} ${f1(d)}`}</text>
          </g>
        ))}
        {/* sear level */}
        {state.searLevel && (
          <g data-part="sear">
            <line x1={60} x2={280} y1={y(orificeMm)} y2={y(orificeMm)} stroke={GUTTA_STRONG} strokeWidth="3" />
            <text x={60} y={y(orificeMm) - 5} fontSize="11" fill={GUTTA_STRONG}>
              {state.searLevel.atOrifice ? 'seared at orifice' : 'seared'}
              {state.searLevel.relativeToCejMm !== undefined
                ? ` (${f1(state.searLevel.relativeToCejMm)} mm to CEJ)`
                : ''}
            </text>
          </g>
        )}
        {/* CWL */}
        <line x1={20} x2={320} y1={y(cwl)} y2={y(cwl)} stroke={INK} strokeWidth="3" />
        <text x={20} y={y(cwl) + 18} fontSize="13" fontWeight="bold" fill={INK}>
          CWL {f1(cwl)} mm
        </text>
      </svg>
      <figcaption className="text-sm text-muted">
        {caption ?? canalTitle(state.name)}
        {estimated ? ' · * orifice estimated' : ''}
      </figcaption>
    </figure>
  );
}
