// The derived state of one canal (docs/rules.md, "Derived canal state").
import type { EventType, RadiographPurpose } from './events';
import { isCompactionComplete, type CanalThirds } from './thirds';
import { instant } from './timeline';
import { latest, latestBefore, type CanalView } from './view';

export type CanalStatus =
  'set-up' | 'verified' | 'cone-fitted' | 'compacting' | 'filled' | 'seared' | 'restored' | 'submitted';

export interface CanalState {
  status: CanalStatus;
  name: string;
  referencePoint: string;
  cwlMm: number;
  mafSize: string;
  preparation: string;
  spreader?: string;
  accessorySize?: string;
  /** The sealer the master cone was seated with, else the one planned at set-up. */
  sealer?: string;
  orificeDepthMm?: number;
  setting: 'block' | 'extracted' | 'patient';
  tooth?: number;
  masterCone: {
    eventId: string;
    size: string;
    lengthMm: number;
    reachedLength: boolean;
    tugBack?: boolean;
    seated: boolean;
  } | null;
  accessories: {
    eventId: string;
    size: string;
    lengthMm: number;
    reachedLength: boolean;
    removed: boolean;
    spreaderDepthMm?: number;
  }[];
  accessoryCones: number;
  conesWithdrawn: number;
  spreaderDepths: number[];
  taperCheckDepthMm?: number;
  thirds: CanalThirds;
  complete: boolean;
  /** A `compaction.finished` stands (recorded by tablets from contract version 2). */
  compactionFinished: boolean;
  /** No master cone was ever seated in this canal: it is not filled, whatever its status. */
  unfilled: boolean;
  searLevel?: { atOrifice: boolean; relativeToCejMm?: number };
  /** Event ids of `radiograph.taken` by purpose (the event holds the radiographId once uploaded). */
  radiographs: Record<RadiographPurpose, string[]>;
  firstEventAt?: string;
  lastEventAt?: string;
  durationMs: number;
  eventCount: number;
}

// The furthest step any event reaches sets the status. Notes, CWL corrections and post-op
// radiographs move nothing; approved / returned come from sign-off records on the server.
const STATUS_ORDER: readonly CanalStatus[] = [
  'set-up',
  'verified',
  'cone-fitted',
  'compacting',
  'filled',
  'seared',
  'restored',
  'submitted',
];
const STATUS_OF: Partial<Record<EventType, CanalStatus>> = {
  'canal.added': 'set-up',
  'seat.checked': 'verified',
  'taper.checked': 'verified',
  'canal.rinsed': 'verified',
  'canal.dried': 'verified',
  'master.fitted': 'cone-fitted',
  'master.seated': 'compacting',
  'spreader.placed': 'compacting',
  'compaction.finished': 'compacting',
  'accessory.placed': 'compacting',
  'accessory.removed': 'compacting',
  'fill.assessed': 'filled',
  'gp.seared': 'seared',
  'gp.compacted': 'seared',
  'chamber.cleaned': 'seared',
  'access.restored': 'restored',
  'case.submitted': 'submitted',
};
const RADIOGRAPH_STATUS: Record<RadiographPurpose, CanalStatus | undefined> = {
  'working-length': 'verified',
  maf: 'verified',
  'cone-fit': 'cone-fitted',
  'fill-check': 'filled',
  'post-op': undefined,
};

function statusOf(v: CanalView): CanalStatus {
  let rank = 0;
  let seared = false;
  for (const e of v.events) {
    if (e.type === 'gp.seared') seared = true;
    // A case-level restoration restores only the canals already seared when it was recorded.
    if (e.type === 'access.restored' && e.canalId === undefined && !seared) continue;
    const s = e.type === 'radiograph.taken' ? RADIOGRAPH_STATUS[e.data.purpose] : STATUS_OF[e.type];
    if (s !== undefined) rank = Math.max(rank, STATUS_ORDER.indexOf(s));
  }
  return STATUS_ORDER[rank] ?? 'set-up';
}

export function deriveState(v: CanalView): CanalState {
  const setup = v.canalAdded.data;
  const spreaders = v.of('spreader.placed');
  const fit = latest(v.of('master.fitted'));
  const placed = v.of('accessory.placed');
  const placedIds = new Set(placed.map((a) => a.e.id));
  const sear = latest(v.of('gp.seared'))?.e.data;
  const taper = latestBefore(v.of('taper.checked'), v.lastSeat?.i);
  const spreaderDepths = spreaders.map((s) => s.e.data.depthMm);
  const radiographs: CanalState['radiographs'] = {
    'working-length': [],
    maf: [],
    'cone-fit': [],
    'fill-check': [],
    'post-op': [],
  };
  for (const r of v.of('radiograph.taken')) radiographs[r.e.data.purpose].push(r.e.id);
  const first = v.events[0];
  const last = latest(v.events);

  const state: CanalState = {
    status: statusOf(v),
    name: setup.name,
    referencePoint: setup.referencePoint,
    cwlMm: v.cwlMm,
    mafSize: setup.mafSize,
    preparation: setup.preparation,
    setting: v.caseOpened.data.setting,
    masterCone:
      fit === undefined
        ? null
        : {
            eventId: fit.e.id,
            size: fit.e.data.size,
            lengthMm: fit.e.data.lengthMm,
            reachedLength: fit.e.data.reachedLength,
            ...(fit.e.data.tugBack === undefined ? {} : { tugBack: fit.e.data.tugBack }),
            seated: v.lastSeat !== undefined && v.lastSeat.i > fit.i,
          },
    accessories: placed.map((a) => {
      const depth = latestBefore(spreaders, a.i)?.e.data.depthMm;
      return {
        eventId: a.e.id,
        size: a.e.data.size,
        lengthMm: a.e.data.lengthMm,
        reachedLength: a.e.data.reachedLength,
        removed: v.withdrawn.has(a.e.id),
        ...(depth === undefined ? {} : { spreaderDepthMm: depth }),
      };
    }),
    accessoryCones: placed.filter((a) => !v.withdrawn.has(a.e.id)).length,
    conesWithdrawn: [...v.withdrawn].filter((id) => placedIds.has(id)).length,
    spreaderDepths,
    thirds: v.thirds,
    complete: isCompactionComplete(latest(spreaderDepths), v.thirds),
    compactionFinished: v.of('compaction.finished').length > 0,
    unfilled: v.firstSeat === undefined,
    radiographs,
    durationMs: first !== undefined && last !== undefined ? instant(last) - instant(first) : 0,
    eventCount: v.events.length,
  };
  const optional = {
    spreader: setup.spreader,
    accessorySize: setup.accessorySize,
    sealer: latest(v.of('master.seated'))?.e.data.sealer ?? setup.sealer,
    orificeDepthMm: setup.orificeDepthMm,
    tooth: v.tooth,
    taperCheckDepthMm: taper?.e.data.depthMm,
    searLevel:
      sear === undefined
        ? undefined
        : {
            atOrifice: sear.atOrifice,
            ...(sear.relativeToCejMm === undefined ? {} : { relativeToCejMm: sear.relativeToCejMm }),
          },
    firstEventAt: first?.at,
    lastEventAt: last?.at,
  };
  // Absent values are left out rather than set to undefined, so the state compares and serialises cleanly.
  for (const [k, val] of Object.entries(optional))
    if (val !== undefined) (state as unknown as Record<string, unknown>)[k] = val;
  return state;
}
