import { fdiToUniversal, toothName } from '../../lib/rules/core';
import { DemoBanner } from '../shared/DemoBanner';
import { SETTING_LABEL } from '../../lib/present/labels';
import type { CaseInfo } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { SyncBadge } from './SyncBadge';

// Only the attending's decisions are news on the tablet; open and submitted it knows itself.
const REVIEW_WORD: Record<string, string | undefined> = {
  approved: 'approved by the attending',
  returned: 'returned for changes',
};

/** The Coneline mark, the tooth and setting, the sync state, and the way out; the demo line above them. */
export function TopBar(props: { info: CaseInfo | null; onCases: () => void; onSignOut: () => void }) {
  const user = useChairside((s) => s.identity.user);
  const showUniversal = useChairside((s) => s.showUniversal);
  const toggleUniversal = useChairside((s) => s.toggleUniversal);
  const demo = useChairside((s) => s.identity.demo);
  const review = useChairside((s) => (props.info ? s.reviews[props.info.caseId] : undefined));
  const info = props.info;
  return (
    <header className="bg-white border-b-2 border-line">
      {demo && <DemoBanner />}
      <div className="px-3 py-2 flex flex-wrap items-center gap-2">
        <span className="font-bold text-2xl tracking-tight mr-2" role="img" aria-label="Coneline">
          <span className="border-b-4 border-gutta pb-0.5" aria-hidden="true">
            Cone
          </span>
          <span aria-hidden="true">line</span>
        </span>
        {info && (
          <div className="flex items-center gap-2" data-testid="case-label">
            <p className="text-lg">
              <span className="font-bold">{info.tooth ? `Tooth ${info.tooth}` : 'Block'}</span>
              {info.tooth && showUniversal && <span> (Universal {fdiToUniversal(info.tooth)})</span>}
              <span className="text-muted">
                {' '}
                · {SETTING_LABEL[info.setting]}
                {info.tooth ? ` · ${toothName(info.tooth)}` : ''}
                {info.chartRef ? ` · chart ${info.chartRef}` : ''}
                {review && REVIEW_WORD[review] ? ` · ${REVIEW_WORD[review]}` : ''}
              </span>
            </p>
            {info.tooth && (
              <button
                type="button"
                aria-pressed={showUniversal}
                onClick={toggleUniversal}
                className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-edge bg-white text-base"
              >
                Universal
              </button>
            )}
          </div>
        )}
        <div className="ml-auto flex flex-wrap items-center gap-2">
          <SyncBadge />
          {info && (
            <button
              type="button"
              onClick={props.onCases}
              className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-ink bg-white font-bold"
            >
              Cases
            </button>
          )}
          {user && (
            <button
              type="button"
              onClick={props.onSignOut}
              className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-ink bg-white"
            >
              <span className="font-bold">Sign out</span> <span className="text-sm">{user.name}</span>
            </button>
          )}
        </div>
      </div>
    </header>
  );
}
