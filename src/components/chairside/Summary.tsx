import type { EventData, EventType } from '../../lib/contract';
import { useMemo, useState } from 'react';
import type { LogEvent } from '../../lib/rules/core';
import { field, liveEvents, type CanalInfo, type CaseInfo } from '../../lib/client/events';
import { useChairside } from '../../lib/client/store';
import { shownResult } from '../../lib/client/views';
import { CanalDiagram } from '../shared/CanalDiagram';
import { Answer, Answers, Chip, ChipGroup, StepCard } from './AnswerButtons';
import { FindingList } from './FindingList';

const MATERIALS = {
  temporary: ['glass ionomer', 'temporary filling', 'cotton + temporary'],
  permanent: ['composite', 'amalgam', 'glass ionomer'],
};

/** Finishing the tooth: access restoration, post-op radiograph, each canal's findings, submit. */
export function Summary(props: { info: CaseInfo; canals: CanalInfo[]; events: LogEvent[] }) {
  const { info, canals, events } = props;
  const rows = useChairside((s) => s.rows);
  const server = useChairside((s) => s.server);
  const record = useChairside((s) => s.record);
  const [kind, setKind] = useState<'temporary' | 'permanent'>('temporary');
  const [material, setMaterial] = useState<string | undefined>();
  const live = useMemo(() => liveEvents(events), [events]);
  const restored = live.find((e) => e.type === 'access.restored' && !e.canalId);
  const postOp = live.some((e) => e.type === 'radiograph.taken' && field(e, 'purpose') === 'post-op');
  const submitted = live.some((e) => e.type === 'case.submitted');
  const tooth = info.setting !== 'block';
  const rec = <T extends EventType>(type: T, data: EventData<T>, label: string) => record(type, data, { label });

  return (
    <div className="flex flex-col gap-4">
      {!restored ? (
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
      ) : (
        <p className="text-lg">
          ✓ Access restored: {String(field(restored, 'kind'))}
          {field(restored, 'material') ? `, ${String(field(restored, 'material'))}` : ''}
        </p>
      )}
      {tooth &&
        (!postOp ? (
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
        ) : (
          <p className="text-lg">✓ Post-operative radiograph taken</p>
        ))}
      <div className="grid gap-4 landscape:grid-cols-2">
        {canals.map((c) => {
          const shown = shownResult(rows, server, events, info.caseId, c.canalId);
          return (
            <section
              key={c.canalId}
              aria-label={`Canal ${c.name}`}
              className="bg-white rounded-2xl border border-line p-3"
            >
              <h2 className="text-xl font-bold">Canal {c.name}</h2>
              <div className="grid grid-cols-[160px_1fr] gap-3">
                {shown.result && <CanalDiagram state={shown.result.state} />}
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
      ) : (
        <Answers>
          <Answer tone="primary" onTap={() => void rec('case.submitted', {}, 'submitted for review')}>
            Submit for review
          </Answer>
        </Answers>
      )}
    </div>
  );
}
