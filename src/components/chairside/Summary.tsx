import { useState } from 'react';
import { canalTitle, isUnfilled } from '../../lib/present/labels';
import type { EventData, EventType } from '../../lib/contract';
import type { EventOf } from '../../lib/rules/core';
import type { CaseInfo, TabletCase } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { shownResult } from '../../lib/client/views';
import { CanalDiagram } from '../shared/CanalDiagram';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';
import { Guarded } from './useCardGuard';
import { FindingList } from './FindingList';

const MATERIALS = {
  temporary: ['glass ionomer', 'temporary filling', 'cotton + temporary'],
  permanent: ['composite', 'amalgam', 'glass ionomer'],
};

/** Finishing the tooth: access restoration, post-op radiograph, each canal's findings, submit. */
export function Summary(props: { info: CaseInfo; tablet: TabletCase; locked?: boolean }) {
  const { info, locked = false } = props;
  const { canals, caseLevel } = props.tablet;
  const rows = useChairside((s) => s.rows);
  const server = useChairside((s) => s.server);
  const record = useChairside((s) => s.record);
  const [kind, setKind] = useState<'temporary' | 'permanent'>('temporary');
  const [material, setMaterial] = useState<string | undefined>();
  const [confirming, setConfirming] = useState(false);
  // Case-level events that count, as the rules core reads them.
  const restored = caseLevel.find((e): e is EventOf<'access.restored'> => e.type === 'access.restored');
  const postOp = caseLevel.some((e) => e.type === 'radiograph.taken' && e.data.purpose === 'post-op');
  // A returned case is submitted again from here; one submitted since is waiting for review.
  const review = useChairside((s) => s.reviews[info.caseId]);
  const submitted = info.submitted && review !== 'returned';
  const tooth = info.setting !== 'block';
  const rec = <T extends EventType>(type: T, data: EventData<T>, label: string) => record(type, data, { label });
  const shownCanals = canals.map((c) => ({
    c,
    shown: shownResult(rows, server, c.reading.result, info.caseId, c.canalId),
  }));
  // Submitting asks first while a canal is unfilled or a stop is open.
  const warnings = shownCanals.flatMap(({ c, shown }) => {
    const out: string[] = [];
    if (shown.result && isUnfilled(shown.result.state))
      out.push(`${canalTitle(c.name)} is unfilled (no master cone seated).`);
    const stops = (shown.result?.findings ?? []).filter((f) => f.severity === 'stop').length;
    if (stops > 0) out.push(`${canalTitle(c.name)} has ${stops} open stop${stops === 1 ? '' : 's'}.`);
    return out;
  });

  return (
    // Recording the restoration moves the radiograph card up under the finger: guard the change.
    <Guarded screen={`${restored ? 'restored' : ''}|${postOp ? 'post-op' : ''}|${confirming}|${submitted}`}>
      <div className="flex flex-col gap-4">
        {!restored && !locked ? (
          <StepCard title="Restore the access" hint="Once for the tooth; it counts for every canal.">
            <ChipGroup label="Restoration">
              <Chip
                selected={kind === 'temporary'}
                onTap={() => {
                  setKind('temporary');
                  setMaterial(undefined);
                }}
              >
                Temporary
              </Chip>
              <Chip
                selected={kind === 'permanent'}
                onTap={() => {
                  setKind('permanent');
                  setMaterial(undefined);
                }}
              >
                Permanent
              </Chip>
            </ChipGroup>
            <ChipGroup label="Material (optional)">
              {MATERIALS[kind].map((m) => (
                <Chip key={m} selected={material === m} onTap={() => setMaterial(material === m ? undefined : m)}>
                  {m}
                </Chip>
              ))}
            </ChipGroup>
            <Answers>
              <Answer
                tone="primary"
                onTap={() =>
                  void rec('access.restored', { kind, ...(material ? { material } : {}) }, `access restored (${kind})`)
                }
              >
                Restored
              </Answer>
            </Answers>
          </StepCard>
        ) : restored ? (
          <p className="text-lg">
            ✓ Access restored: {restored.data.kind}
            {restored.data.material ? `, ${restored.data.material}` : ''}
          </p>
        ) : null}
        {tooth &&
          (!postOp && !locked ? (
            <StepCard title="Post-operative radiograph taken?">
              <Answers>
                <Answer
                  tone="primary"
                  onTap={() => void rec('radiograph.taken', { purpose: 'post-op' }, 'post-op radiograph')}
                >
                  Taken
                </Answer>
              </Answers>
            </StepCard>
          ) : postOp ? (
            <p className="text-lg">✓ Post-operative radiograph taken</p>
          ) : null)}
        <div className="grid gap-4 landscape:grid-cols-2">
          {shownCanals.map(({ c, shown }) => {
            return (
              <section
                key={c.canalId}
                aria-label={canalTitle(c.name)}
                className="bg-white rounded-2xl border border-line p-3"
              >
                <h2 className="text-xl font-bold">
                  {canalTitle(c.name)}
                  {shown.result && isUnfilled(shown.result.state) ? (
                    <span className="ml-2 text-base font-normal">· unfilled</span>
                  ) : null}
                </h2>
                <div className="grid grid-cols-[minmax(0,14rem)_1fr] gap-3">
                  {shown.result && <CanalDiagram state={shown.result.state} compact />}
                  <FindingList findings={shown.result?.findings ?? []} source={shown.source} />
                </div>
              </section>
            );
          })}
        </div>
        {submitted ? (
          <p className="text-xl font-bold" data-testid="submitted">
            ✓ Submitted for review
          </p>
        ) : confirming && warnings.length > 0 ? (
          <StepCard
            title="Submit with these open?"
            hint="Your attending sees them; you can withdraw the submission until they act."
          >
            <ul className="list-disc pl-6 text-lg" data-testid="submit-warnings">
              {warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
            <Answers>
              <Answer tone="primary" onTap={() => void rec('case.submitted', {}, 'submitted for review')}>
                Submit anyway
              </Answer>
              <Answer onTap={() => setConfirming(false)}>Not yet</Answer>
            </Answers>
          </StepCard>
        ) : (
          <Answers>
            <Answer
              tone="primary"
              onTap={() =>
                warnings.length > 0 ? setConfirming(true) : void rec('case.submitted', {}, 'submitted for review')
              }
            >
              Submit for review
            </Answer>
          </Answers>
        )}
      </div>
    </Guarded>
  );
}
