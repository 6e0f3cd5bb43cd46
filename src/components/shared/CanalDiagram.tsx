import type { CanalState } from '../../lib/rules/core';
import { canalTitle } from '../../lib/present/labels';
import { cejLevel, mmValue } from '../../lib/present/format';
import { spreadLabels } from '../../lib/present/layout';

/** The parts of a canal's derived state the diagram draws (CanalState from the rules core). */
export type DiagramState = Pick<
  CanalState,
  'name' | 'referencePoint' | 'cwlMm' | 'thirds' | 'masterCone' | 'accessories' | 'spreaderDepths' | 'searLevel'
>;

// Drawn narrow so that its words stay readable where it is shown small (a portrait tablet's
// side column, the summary): about 1 px of text per viewBox unit at 260 px wide.
const W = 260;
const H = 420;
const TOP = 30;
const BOTTOM = 26;
const CX = 124;
const BAND = 28; // the thirds' shading starts here; their names stand upright left of it
const INK = '#17212E';
const GUTTA = '#D9683B';
const GUTTA_STRONG = '#B4521F';
const STOP = '#B3261E';
const MUTED = '#4A5566';

const f1 = mmValue;
const cut = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s);

/** What the sear-off left, in the one wording every screen uses for the CEJ level. */
function searWords(sear: NonNullable<DiagramState['searLevel']>): string {
  const where = sear.atOrifice ? 'seared at the orifice' : 'seared below the orifice';
  return sear.relativeToCejMm === undefined ? where : `${where}, ${cejLevel(sear.relativeToCejMm)}`;
}

/** One column of labels beside the canal, each with a leader to its point when it had to move. */
function Column(props: {
  items: { key: string; y: number; text: string; fill: string; toX: number }[];
  x: number;
  anchor: 'start' | 'end';
  top: number;
  bottom: number;
  fs: number;
}) {
  const h = props.fs + 2;
  const at = spreadLabels(
    props.items.map((i) => i.y),
    h,
    props.top,
    props.bottom,
  );
  // A column too full for its words at full size draws them smaller rather than on top of each other.
  const fs = Math.min(props.fs, ((props.bottom - props.top) / Math.max(props.items.length, 1)) * 0.85);
  const edge = props.anchor === 'end' ? props.x + 2 : props.x - 2;
  return props.items.map((item, i) => (
    <g key={item.key}>
      {Math.abs(at[i]! - item.y) > 2 && (
        <line x1={edge} y1={at[i]} x2={item.toX} y2={item.y} stroke={MUTED} strokeWidth="0.75" />
      )}
      <text x={props.x} y={at[i]} fontSize={fs} textAnchor={props.anchor} dominantBaseline="central" fill={item.fill}>
        {item.text}
      </text>
    </g>
  ));
}

/**
 * The canal from reference point to CWL: thirds shaded, orifice and CWL marked, the master
 * cone, each accessory cone at its length (removed cones dashed and crossed), spreader
 * depths as ticks on the right, and the sear level, with nothing drawn above it once seared.
 * Labels are placed so that none covers another. `compact` (the summary's small diagrams)
 * draws fewer, larger words: no per-cone or per-depth labels. Pure SVG: chairside and review.
 */
export function CanalDiagram({
  state,
  caption,
  compact = false,
}: {
  state: DiagramState;
  caption?: string;
  compact?: boolean;
}) {
  const cwl = state.cwlMm || 1;
  const { orificeMm, coronalEndMm, middleEndMm, estimated } = state.thirds;
  const kept = state.accessories.filter((a) => !a.removed);
  const removed = state.accessories.filter((a) => a.removed);
  // Room for anything recorded past the CWL, so it is drawn where it is and not cut off.
  const deepest = Math.max(
    cwl,
    state.masterCone?.lengthMm ?? 0,
    ...state.accessories.map((a) => a.lengthMm),
    ...state.spreaderDepths,
  );
  const k = (H - TOP - BOTTOM) / deepest;
  const y = (mm: number) => TOP + Math.max(0, mm) * k;
  const sear = state.searLevel;
  // Cones stand out of the canal until sear-off; after it nothing is left above the sear line.
  const coneTop = (aboveMm: number) => y(sear ? orificeMm : orificeMm - aboveMm);
  const fs = compact ? 16 : 13;
  // Canal walls taper from 46 px wide at the orifice to 8 px at the CWL.
  const half = (mm: number) => 4 + (19 * (cwl - mm)) / Math.max(cwl - orificeMm, 1);
  const wall = (side: 1 | -1) => [orificeMm, cwl].map((mm) => `${CX + side * half(mm)},${y(mm)}`).join(' ');
  const canal = `${wall(-1)} ${[...[orificeMm, cwl].map((mm) => `${CX + half(mm)},${y(mm)}`)].reverse().join(' ')}`;
  // Kept cones fan out beside the master cone, alternating sides, and meet it at their tips.
  const offset = (i: number) => (i % 2 === 0 ? -1 : 1) * (9 + 5 * Math.floor(i / 2));
  const columnTop = y(orificeMm) + 3;
  const columnBottom = y(cwl) - 3;
  // The orifice's name sits above its line, or in the reference label when the two meet (a block).
  const crownRoom = y(orificeMm) - TOP > fs + 6;
  const orificeWord = `${sear ? 'sear level' : 'orifice'}${estimated ? '*' : ''}`;

  const summary = [
    `${canalTitle(state.name)}: CWL ${f1(cwl)} mm`,
    state.masterCone
      ? `master cone ${state.masterCone.size} at ${f1(state.masterCone.lengthMm)} mm`
      : 'no master cone yet',
    `${kept.length} accessory cone${kept.length === 1 ? '' : 's'} kept`,
    removed.length ? `${removed.length} removed` : '',
    state.spreaderDepths.length ? `spreader depths ${state.spreaderDepths.map(f1).join(', ')} mm` : '',
    sear ? searWords(sear) : '',
  ]
    .filter(Boolean)
    .join('; ');

  return (
    <figure className="m-0">
      <svg
        viewBox={`0 0 ${W} ${H}`}
        role="img"
        aria-label={summary}
        className="w-full h-auto max-h-[max(16rem,calc(100dvh-22rem))]"
        data-testid="canal-diagram"
      >
        <title>{summary}</title>
        {/* thirds, named upright beside the shading when there is room for the word */}
        {(
          [
            ['coronal', orificeMm, coronalEndMm, '#EFE9DD'],
            ['middle', coronalEndMm, middleEndMm, '#F8F6F1'],
            ['apical', middleEndMm, cwl, '#E4DCCB'],
          ] as const
        ).map(([label, a, b, fill]) => {
          const mid = (y(a) + y(b)) / 2;
          return (
            <g key={label}>
              <rect x={BAND} y={y(a)} width={W - BAND - 4} height={y(b) - y(a)} fill={fill} />
              {y(b) - y(a) > label.length * fs * 0.6 && (
                <text
                  x={BAND - 6}
                  y={mid}
                  fontSize={fs}
                  fill={MUTED}
                  textAnchor="middle"
                  transform={`rotate(-90 ${BAND - 6} ${mid})`}
                >
                  {label}
                </text>
              )}
            </g>
          );
        })}
        {/* reference point and orifice */}
        <line x1={4} x2={W - 4} y1={TOP} y2={TOP} stroke={INK} strokeWidth="2" />
        <text x={4} y={TOP - 8} fontSize={fs} fill={INK}>
          {`ref: ${cut(state.referencePoint, compact ? 16 : 30)}${crownRoom ? '' : ` · ${orificeWord}`}`}
        </text>
        <line x1={BAND} x2={W - 4} y1={y(orificeMm)} y2={y(orificeMm)} stroke={MUTED} strokeDasharray="5 4" />
        {crownRoom && (
          <text x={BAND} y={y(orificeMm) - 5} fontSize={fs} fill={sear ? GUTTA_STRONG : MUTED}>
            {orificeWord}
          </text>
        )}
        <polygon points={canal} fill="#FFFFFF" stroke={INK} strokeWidth="1.5" />
        {/* master cone */}
        {state.masterCone && (
          <polygon
            data-part="master"
            points={`${CX - 7},${coneTop(2)} ${CX + 7},${coneTop(2)} ${CX + 2},${y(state.masterCone.lengthMm)} ${CX - 2},${y(state.masterCone.lengthMm)}`}
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
              y1={coneTop(3)}
              y2={y(a.lengthMm)}
              stroke={a.reachedLength ? GUTTA_STRONG : STOP}
              strokeWidth="3"
              strokeLinecap={sear ? 'butt' : 'round'}
            />
            <circle
              cx={CX + offset(i) * 0.35}
              cy={y(a.lengthMm)}
              r="3.5"
              fill={a.reachedLength ? GUTTA_STRONG : STOP}
            />
          </g>
        ))}
        {removed.slice(0, 6).map((a, i) => (
          <g key={a.eventId} data-part="removed">
            <line
              x1={W - 34 + i * 5}
              x2={W - 34 + i * 5}
              y1={coneTop(3)}
              y2={y(a.lengthMm)}
              stroke={MUTED}
              strokeWidth="2"
              strokeDasharray="4 3"
            />
            <path d={`M${W - 37 + i * 5},${y(a.lengthMm) - 3}l6,6m0,-6l-6,6`} stroke={MUTED} strokeWidth="1.5" />
          </g>
        ))}
        {/* spreader depths */}
        {state.spreaderDepths.map((d, i) => (
          <polygon
            key={i}
            data-part="spreader"
            points={`${CX + 26},${y(d)} ${CX + 36},${y(d) - 5} ${CX + 36},${y(d) + 5}`}
            fill={INK}
          />
        ))}
        {!compact && (
          <>
            <Column
              items={kept.map((a, i) => ({
                key: a.eventId,
                y: y(a.lengthMm),
                text: `A${i + 1} ${f1(a.lengthMm)}${a.reachedLength ? '' : ' short'}`,
                fill: a.reachedLength ? INK : STOP,
                toX: CX + offset(i) * 0.35 - 4,
              }))}
              x={CX - 24}
              anchor="end"
              top={columnTop}
              bottom={columnBottom}
              fs={fs}
            />
            <Column
              items={state.spreaderDepths.map((d, i) => ({
                key: String(i),
                y: y(d),
                text: `S${i + 1} ${f1(d)}`,
                fill: INK,
                toX: CX + 37,
              }))}
              x={CX + 42}
              anchor="start"
              top={columnTop}
              bottom={columnBottom}
              fs={fs}
            />
          </>
        )}
        {/* sear level: drawn at the orifice, its words in the caption below */}
        {sear && (
          <line
            data-part="sear"
            x1={BAND}
            x2={W - 4}
            y1={y(orificeMm)}
            y2={y(orificeMm)}
            stroke={GUTTA_STRONG}
            strokeWidth="3"
          />
        )}
        {/* CWL */}
        <line x1={4} x2={W - 4} y1={y(cwl)} y2={y(cwl)} stroke={INK} strokeWidth="3" />
        <text x={4} y={y(cwl) + fs + 5} fontSize={fs + 1} fontWeight="bold" fill={INK}>
          CWL {f1(cwl)} mm
        </text>
      </svg>
      <figcaption className="text-sm text-muted">
        {caption ?? canalTitle(state.name)}
        {sear ? ` · ${searWords(sear)}` : ''}
        {removed.length ? ` · dashed and crossed: ${removed.length} removed` : ''}
        {estimated ? ' · * orifice estimated' : ''}
      </figcaption>
    </figure>
  );
}
