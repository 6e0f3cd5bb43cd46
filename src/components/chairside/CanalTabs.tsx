import type { CanalInfo } from '../../lib/client/derive';
import { canalStatusLabel } from '../../lib/present/labels';

/** Canals as large tabs with a small status word, plus "Add canal" and "Finish tooth". */
export function CanalTabs(props: {
  canals: CanalInfo[];
  statuses: Record<string, string | undefined>;
  selected: string | null;
  view: 'canal' | 'add' | 'finish';
  onSelect: (canalId: string) => void;
  onAdd: () => void;
  onFinish: () => void;
}) {
  const tab = (active: boolean) =>
    `min-h-16 min-w-24 px-4 rounded-t-xl border-2 border-b-0 text-xl font-bold ${active ? 'bg-white border-gutta-strong text-ink' : 'bg-paper border-edge text-ink'}`;
  return (
    <nav aria-label="Canals" className="flex flex-wrap gap-2 px-3 pt-3 landscape:pt-2 border-b-2 border-gutta-strong">
      {props.canals.map((c) => {
        const active = props.view === 'canal' && props.selected === c.canalId;
        const status = props.statuses[c.canalId];
        return (
          <button
            key={c.canalId}
            type="button"
            aria-current={active ? 'page' : undefined}
            data-testid={`tab-${c.name}`}
            onClick={() => props.onSelect(c.canalId)}
            className={tab(active)}
          >
            {c.name}
            {status && <span className="block text-sm font-normal">{canalStatusLabel(status)}</span>}
          </button>
        );
      })}
      <button
        type="button"
        aria-current={props.view === 'add' ? 'page' : undefined}
        onClick={props.onAdd}
        className={tab(props.view === 'add')}
      >
        + Canal
      </button>
      {props.canals.length > 0 && (
        <button
          type="button"
          aria-current={props.view === 'finish' ? 'page' : undefined}
          onClick={props.onFinish}
          className={tab(props.view === 'finish')}
        >
          Finish tooth
        </button>
      )}
    </nav>
  );
}
