// Checks up to the seated master cone: CWL, seat and taper checks, radiographs, rinse,
// paper points and the master cone fit.
import { averageLengthMm } from './anatomy';
import { raise, type Finding } from './severities';
import { toothName } from './teeth';
import { atLeast, beyondMargin, differs, fmtMm, gt, latest, latestBefore, type CanalView } from './view';

export function setupChecks(v: CanalView): Finding[] {
  return [...cwlChecks(v), ...seatChecks(v), ...rinseAndDryChecks(v), ...masterConeChecks(v)];
}

function cwlChecks(v: CanalView): Finding[] {
  const out: Finding[] = [];
  // Only the correction in use is judged: a later correction with a reason replaces it.
  const correction = latest(v.of('canal.cwlCorrected'));
  if (correction !== undefined && correction.e.data.reason === '') {
    out.push(
      raise(
        'cwl-corrected-without-reason',
        `The CWL was corrected to ${fmtMm(correction.e.data.cwlMm)} with no reason: add a note saying why (a new radiograph, an apex-locator reading, lost length) so your attending can follow the change.`,
        correction.e.id,
      ),
    );
  }
  if (!v.isTooth || v.tooth === undefined) return out;
  const avg = averageLengthMm(v.tooth);
  if (avg === null || !beyondMargin(v.cwlMm, avg, v.tol.cwlUnusualMarginMm)) return out;
  const side = v.cwlMm > avg ? 'longer' : 'shorter';
  out.push(
    raise(
      'cwl-unusual-for-tooth',
      `The CWL of ${fmtMm(v.cwlMm)} is ${fmtMm(Math.abs(v.cwlMm - avg))} ${side} than an average ${toothName(v.tooth)} (${fmtMm(avg)}): check the length and the reference point; an unusual tooth can be right.`,
      v.cwlEventId,
    ),
  );
  return out;
}

function seatChecks(v: CanalView): Finding[] {
  const out: Finding[] = [];
  const seat = v.lastSeat;
  const cwl = fmtMm(v.cwlMm);
  // The latest seat and taper checks before the (latest) seating count; before any seating,
  // the latest taper check is judged at once so the tablet can answer straight away.
  const taper = latestBefore(v.of('taper.checked'), seat?.i);
  // The same for the seat check: judged at the tap, cleared by a later passing check.
  const check = latestBefore(v.of('seat.checked'), seat?.i);
  if (seat !== undefined && check === undefined) {
    out.push(
      raise(
        'seat-not-confirmed',
        'You seated the master cone with no seat check of the MAF before it: check that the MAF seats at the CWL and holds, and ask your attending before going on.',
        seat.e.id,
      ),
    );
  }
  if (check !== undefined) {
    if (differs(check.e.data.lengthMm, v.cwlMm)) {
      out.push(
        raise(
          'seat-not-confirmed',
          `The last seat check was at ${fmtMm(check.e.data.lengthMm)}, not at the CWL of ${cwl}: check the MAF again at the CWL.`,
          check.e.id,
        ),
      );
    } else if (check.e.data.result === 'advances') {
      out.push(
        raise(
          'seat-not-confirmed',
          'The MAF went past the CWL at the last seat check: the apical stop may be lost; ask your attending before going on.',
          check.e.id,
        ),
      );
    } else if (check.e.data.result === 'short') {
      out.push(
        raise(
          'seat-not-confirmed',
          'The MAF did not reach the CWL at the last seat check: check the length again and ask your attending before going on.',
          check.e.id,
        ),
      );
    }
    if (check.e.data.fileSize !== v.canalAdded.data.mafSize) {
      out.push(
        raise(
          'seat-file-not-maf',
          `The seat was checked with a size ${check.e.data.fileSize} file, but the MAF is ${v.canalAdded.data.mafSize}: check the seat with the MAF itself.`,
          check.e.id,
        ),
      );
    }
  }
  if (seat !== undefined) {
    if (taper === undefined) {
      out.push(
        raise(
          'taper-not-checked',
          'You seated the master cone with no taper check before it: tell your attending, and check the taper with the spreader first next time.',
          seat.e.id,
        ),
      );
    }
    // "With no MAF radiograph": one recorded anywhere counts, even if tapped after seating.
    if (v.isTooth && v.of('radiograph.taken').every((r) => r.e.data.purpose !== 'maf')) {
      out.push(
        raise(
          'maf-radiograph-missing',
          'No MAF radiograph is recorded: record it if you took one, or tell your attending.',
          seat.e.id,
        ),
      );
    }
  }
  if (taper !== undefined && gt(taper.e.data.depthMm, v.cwlMm)) {
    out.push(
      raise(
        'taper-beyond-cwl',
        `The taper-check spreader went to ${fmtMm(taper.e.data.depthMm)}, past the CWL of ${cwl}: the apical stop may be lost; check the seat of the MAF again and ask your attending before filling.`,
        taper.e.id,
      ),
    );
  }
  if (taper !== undefined && gt(v.cwlMm - taper.e.data.depthMm, v.tol.taperShortMarginMm)) {
    out.push(
      raise(
        'taper-short',
        `The taper-check spreader stopped ${fmtMm(v.cwlMm - taper.e.data.depthMm)} short of the CWL of ${cwl} (more than ${fmtMm(v.tol.taperShortMarginMm)}): the canal may need more shaping; ask your attending before filling.`,
        taper.e.id,
      ),
    );
  }
  return out;
}

function rinseAndDryChecks(v: CanalView): Finding[] {
  const out: Finding[] = [];
  const seat = v.lastSeat;
  if (seat !== undefined) {
    const given = new Set(
      v
        .of('canal.rinsed')
        .filter((r) => r.i < seat.i)
        .flatMap((r) => r.e.data.solutions),
    );
    const missing = [given.has('naocl') ? '' : 'sodium hypochlorite', given.has('edta') ? '' : 'EDTA'].filter(Boolean);
    if (missing.length > 0) {
      out.push(
        raise(
          'final-rinse-incomplete',
          `The rinses before seating did not include ${missing.join(' or ')}: record the rinse if you gave it, or tell your attending.`,
          seat.e.id,
        ),
      );
    }
  }
  for (const d of v.of('canal.dried')) {
    if (gt(d.e.data.measuredMm, v.cwlMm)) {
      out.push(
        raise(
          'paper-point-long',
          `A paper point was measured to ${fmtMm(d.e.data.measuredMm)}, longer than the CWL of ${fmtMm(v.cwlMm)}: measure paper points to the CWL so they cannot pass it.`,
          d.e.id,
        ),
      );
    }
  }
  return out;
}

function masterConeChecks(v: CanalView): Finding[] {
  const out: Finding[] = [];
  const fits = v.of('master.fitted');
  const fit = latest(fits);
  if (fit !== undefined) {
    const { size, lengthMm, reachedLength } = fit.e.data;
    if (size !== v.canalAdded.data.mafSize) {
      out.push(
        raise(
          'master-size-mismatch',
          `The master cone is size ${size} but the MAF is ${v.canalAdded.data.mafSize}: fit a cone of the MAF's size, or tell your attending why not.`,
          fit.e.id,
        ),
      );
    }
    if (!reachedLength) {
      out.push(
        raise(
          'master-length-mismatch',
          'The master cone did not reach its length: fit it again or choose another cone before seating.',
          fit.e.id,
        ),
      );
    } else if (gt(lengthMm, v.cwlMm)) {
      out.push(
        raise(
          'master-beyond-cwl',
          `The master cone was fitted at ${fmtMm(lengthMm)}, ${fmtMm(lengthMm - v.cwlMm)} past the CWL of ${fmtMm(v.cwlMm)}: cut it or choose another cone so it stops at the CWL, and ask your attending before seating.`,
          fit.e.id,
        ),
      );
    } else if (gt(v.cwlMm - lengthMm, v.tol.masterLengthMarginMm)) {
      out.push(
        raise(
          'master-length-mismatch',
          `The master cone was fitted at ${fmtMm(lengthMm)}, ${fmtMm(v.cwlMm - lengthMm)} short of the CWL of ${fmtMm(v.cwlMm)}: fit it to the CWL before seating.`,
          fit.e.id,
        ),
      );
    }
  }
  if (!v.isTooth) return out;
  // A cone-fit radiograph counts once it follows a fit (any radiograph when no fit is recorded).
  const firstFitI = fits[0]?.i ?? -1;
  const coneFitShots = v.of('radiograph.taken').filter((r) => r.e.data.purpose === 'cone-fit' && r.i > firstFitI);
  if (v.lastSeat !== undefined && coneFitShots.length === 0) {
    out.push(
      raise(
        'cone-fit-radiograph-missing',
        'No cone-fit radiograph is recorded after the master cone was fitted: record it if you took one, or tell your attending.',
        v.lastSeat.e.id,
      ),
    );
  }
  const shot = latest(coneFitShots);
  const shown = shot === undefined ? undefined : latestBefore(fits, shot.i);
  // The cone in place now (the latest refit after the radiograph) is compared with the one it showed.
  const refit = shot === undefined ? undefined : latest(fits.filter((x) => x.i > shot.i));
  if (shown !== undefined && refit !== undefined && refit.e.data.size !== shown.e.data.size) {
    out.push(
      raise(
        'cone-fit-retake-needed',
        `The master cone was changed to size ${refit.e.data.size} after the cone-fit radiograph showed size ${shown.e.data.size}: take a new cone-fit radiograph.`,
        refit.e.id,
      ),
    );
  } else if (
    shown !== undefined &&
    refit !== undefined &&
    atLeast(refit.e.data.lengthMm, shown.e.data.lengthMm, v.tol.coneFitRetakeThresholdMm)
  ) {
    out.push(
      raise(
        'cone-fit-retake-needed',
        `The master cone was refitted at ${fmtMm(refit.e.data.lengthMm)}, ${fmtMm(Math.abs(refit.e.data.lengthMm - shown.e.data.lengthMm))} from the ${fmtMm(shown.e.data.lengthMm)} the cone-fit radiograph showed: take a new cone-fit radiograph.`,
        refit.e.id,
      ),
    );
  }
  return out;
}
