// Checks from the fill check to submission: compaction end, fill, sear-off, restoration.
import { raise, type Finding } from './severities';
import { toothGroup } from './teeth';
import { fallbackStopDepthFor } from './thirds';
import { fmtMm, gt, latest, latestBefore, lt, type CanalView } from './view';

export function finishChecks(v: CanalView): Finding[] {
  return [...completionChecks(v), ...searChecks(v), ...fillChecks(v), ...submissionChecks(v)];
}

/**
 * `compaction-incomplete`, judged when compaction is finished and again at sear-off: the
 * latest sear-off's verdict replaces the finish's (one finding at most).
 */
function completionChecks(v: CanalView): Finding[] {
  const sear = latest(v.of('gp.seared'));
  const finish = latest(v.of('compaction.finished'));
  const at = sear ?? finish;
  if (at === undefined) return [];
  const when = sear === undefined ? 'When compaction was finished' : 'At sear-off';
  const last = latestBefore(v.of('spreader.placed'), at.i);
  // On an anterior tooth the rule of thumb is scaled by the tooth's average length (thirds.ts).
  const scaled = v.isTooth && fallbackStopDepthFor(v.tooth, v.tol.fallbackStopDepthMm) !== v.tol.fallbackStopDepthMm;
  const estimate = v.thirds.estimated
    ? ` (No orifice depth was recorded, so the thirds are estimated: the coronal third is taken to end at ${fmtMm(v.thirds.coronalEndMm)}, from the ${fmtMm(v.tol.fallbackStopDepthMm)} rule of thumb${scaled ? " scaled to this tooth type's average length" : ''}.)`
    : '';
  // No spreader placement at all: compaction never started, so it is not complete either
  // (the checks speak only of "the last spreader depth"; this is our reading, docs/rules.md).
  if (last === undefined) {
    return [
      raise(
        'compaction-incomplete',
        `${when} no spreader placement was recorded: tell your attending; compaction goes on until the spreader no longer passes the coronal third.${estimate}`,
        at.e.id,
      ),
    ];
  }
  if (gt(last.e.data.depthMm, v.thirds.coronalEndMm)) {
    return [
      raise(
        'compaction-incomplete',
        `${when} the spreader still reached ${fmtMm(last.e.data.depthMm)}, past the end of the coronal third at ${fmtMm(v.thirds.coronalEndMm)}: tell your attending; place more cones until the spreader no longer passes the coronal third.${estimate}`,
        at.e.id,
      ),
    ];
  }
  return [];
}

function searChecks(v: CanalView): Finding[] {
  const sear = latest(v.of('gp.seared'));
  if (sear === undefined) return [];
  const out: Finding[] = [];
  const kept = v.of('accessory.placed').filter((a) => !v.withdrawn.has(a.e.id));
  if (!v.isTooth) return out;
  const remaining = kept.filter((a) => a.i < sear.i).length;
  if (remaining < v.tol.minAccessoryCones) {
    out.push(
      raise(
        'few-accessory-cones',
        `Only ${remaining} accessory cone${remaining === 1 ? '' : 's'} remained at sear-off, fewer than the usual ${v.tol.minAccessoryCones}: check the fill-check radiograph for even density with your attending.`,
        sear.e.id,
      ),
    );
  }
  const lastCone = latest(kept);
  const fillShots = v
    .of('radiograph.taken')
    .filter((r) => r.e.data.purpose === 'fill-check' && r.i > (lastCone?.i ?? -1));
  if (fillShots.length === 0) {
    out.push(
      raise(
        'fill-check-radiograph-missing',
        'Sear-off is recorded with no fill-check radiograph after the last accessory cone: record it if you took one, or tell your attending.',
        sear.e.id,
      ),
    );
  }
  const cej = sear.e.data.relativeToCejMm;
  if (cej === undefined && v.tooth !== undefined && toothGroup(v.tooth).anterior) {
    out.push(
      raise(
        'sear-level-missing',
        'The sear-off records no level against the CEJ: in an anterior tooth sealer left above it can stain the crown; record the level, or tell your attending.',
        sear.e.id,
      ),
    );
  }
  if (cej !== undefined && lt(cej, 0) && v.tooth !== undefined) {
    const anterior = toothGroup(v.tooth).anterior;
    out.push(
      raise(
        'sear-above-cej',
        anterior
          ? `You seared ${fmtMm(-cej)} above the CEJ of an anterior tooth, where sealer left in the crown can stain it: take the level to the CEJ or below, as your attending advises.`
          : `You seared ${fmtMm(-cej)} above the CEJ: take the level to the orifice or the CEJ, as your attending advises.`,
        sear.e.id,
      ),
    );
  }
  return out;
}

function fillChecks(v: CanalView): Finding[] {
  const fill = latest(v.of('fill.assessed'));
  if (fill === undefined) return [];
  const out: Finding[] = [];
  const { length, voids } = fill.e.data;
  // The contract's categories are drawn at 2 mm: "short-over-2" proves the fill is more than
  // the limit short only while the limit is 2 mm or less, so only then is it raised.
  if (length === 'short-over-2' && v.tol.fillShortLimitMm <= 2) {
    out.push(
      raise(
        'fill-short',
        `The fill ends more than ${fmtMm(v.tol.fillShortLimitMm)} short of the apex: show the radiograph to your attending, who decides whether to redo the fill.`,
        fill.e.id,
      ),
    );
  }
  if (length === 'beyond') {
    out.push(
      raise(
        'fill-beyond',
        'The fill extends beyond the apex: show the radiograph to your attending, who decides whether to redo the fill.',
        fill.e.id,
      ),
    );
  }
  if (voids) {
    out.push(
      raise(
        'fill-voids',
        'The fill check shows voids: show the radiograph to your attending, who decides whether to redo the fill.',
        fill.e.id,
      ),
    );
  }
  return out;
}

function submissionChecks(v: CanalView): Finding[] {
  const submitted = latest(v.of('case.submitted'));
  if (submitted === undefined) return [];
  const out: Finding[] = [];
  // From everything recorded: a restoration or radiograph recorded after submission counts.
  // restoration-missing is not a tooth-only check (docs/rules.md), so it applies to a training block too.
  if (v.of('access.restored').length === 0) {
    out.push(
      raise(
        'restoration-missing',
        "The case was submitted but this canal's access is not restored: record the restoration, or tell your attending.",
        submitted.e.id,
      ),
    );
  }
  if (v.isTooth && v.of('radiograph.taken').every((r) => r.e.data.purpose !== 'post-op')) {
    out.push(
      raise(
        'postop-radiograph-missing',
        'The case was submitted without a post-operative radiograph: take one and record it, or tell your attending.',
        submitted.e.id,
      ),
    );
  }
  return out;
}
