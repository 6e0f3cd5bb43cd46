// Checks of lateral compaction: spreader placements and accessory cones.
import { raise, type Finding } from './severities';
import { beyondMargin, fmtMm, gt, latestBefore, type CanalView } from './view';

export function compactionChecks(v: CanalView): Finding[] {
  const out: Finding[] = [];
  const cwl = fmtMm(v.cwlMm);
  const spreaders = v.of('spreader.placed');
  const accessories = v.of('accessory.placed');
  const kept = accessories.filter((a) => !v.withdrawn.has(a.e.id));
  const seats = v.of('master.seated');

  // Before the master cone was first seated (or with none seated yet). Withdrawn cones are
  // not judged: they are no longer in the canal.
  const firstSeatI = v.firstSeat?.i ?? Number.POSITIVE_INFINITY;
  for (const s of spreaders) {
    if (s.i < firstSeatI)
      out.push(
        raise(
          'compaction-before-seat',
          'You recorded a spreader placement before the master cone was seated: seat the master cone first, or undo the step if the tap was a mistake.',
          s.e.id,
        ),
      );
  }
  for (const a of kept) {
    if (a.i < firstSeatI)
      out.push(
        raise(
          'compaction-before-seat',
          'You recorded an accessory cone before the master cone was seated: seat the master cone first, or undo the step if the tap was a mistake.',
          a.e.id,
        ),
      );
  }

  for (const s of spreaders) {
    if (gt(s.e.data.depthMm, v.cwlMm)) {
      out.push(
        raise(
          'spreader-beyond-cwl',
          `The spreader went to ${fmtMm(s.e.data.depthMm)}, past the CWL of ${cwl}: keep it short of the CWL and tell your attending.`,
          s.e.id,
        ),
      );
    }
  }

  if (v.lastSeat !== undefined) {
    const seatI = v.lastSeat.i;
    const first = spreaders.find((s) => s.i > seatI);
    if (first !== undefined && gt(v.cwlMm - first.e.data.depthMm, v.tol.firstSpreaderMarginMm)) {
      // Never advise force: excess spreader load is the classic cause of vertical root fracture
      // (common practice, no source).
      out.push(
        raise(
          'first-spreader-short',
          `The first spreader placement stopped ${fmtMm(v.cwlMm - first.e.data.depthMm)} short of the CWL of ${cwl} (more than ${fmtMm(v.tol.firstSpreaderMarginMm)}): ask your attending whether to use a finer spreader or to shape the canal further. Extra pressure on a spreader can split the root.`,
          first.e.id,
        ),
      );
    }
  }

  kept.forEach((a, k) => {
    // The previous kept cone, or the master cone seated before this one, opens the cycle.
    const cycleStart = Math.max(kept[k - 1]?.i ?? -1, latestBefore(seats, a.i)?.i ?? -1);
    if (!spreaders.some((s) => s.i > cycleStart && s.i < a.i)) {
      out.push(
        raise(
          'accessory-without-spreader',
          'This accessory cone follows no spreader placement since the previous cone: place the spreader before each cone and record its depth.',
          a.e.id,
        ),
      );
    }
    const spreader = latestBefore(spreaders, a.i);
    if (spreader === undefined) return;
    if (beyondMargin(a.e.data.lengthMm, spreader.e.data.depthMm, v.tol.accessoryLengthMarginMm)) {
      out.push(
        raise(
          'accessory-length-mismatch',
          `The accessory cone was measured to ${fmtMm(a.e.data.lengthMm)} but the spreader reached ${fmtMm(spreader.e.data.depthMm)}: measure each cone to the spreader's depth.`,
          a.e.id,
        ),
      );
    }
    if (a.e.data.size !== spreader.e.data.spreader) {
      out.push(
        raise(
          'accessory-size-mismatch',
          `The accessory cone is size ${a.e.data.size} but the spreader was ${spreader.e.data.spreader}: use cones that match the spreader.`,
          a.e.id,
        ),
      );
    }
  });

  for (const a of kept) {
    if (gt(a.e.data.lengthMm, v.cwlMm)) {
      out.push(
        raise(
          'accessory-beyond-cwl',
          `The accessory cone was measured to ${fmtMm(a.e.data.lengthMm)}, past the CWL of ${cwl}: remove it, and tell your attending.`,
          a.e.id,
        ),
      );
    }
    if (!a.e.data.reachedLength) {
      const depth = latestBefore(spreaders, a.i)?.e.data.depthMm;
      const where = depth === undefined ? 'its length' : `the spreader depth of ${fmtMm(depth)}`;
      out.push(
        raise(
          'accessory-short',
          `The accessory cone stopped short of ${where} and may leave a void: remove it and place another.`,
          a.e.id,
        ),
      );
    }
  }
  return out;
}
