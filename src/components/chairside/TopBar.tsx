import { fdiToUniversal, toothName } from '../../lib/rules/core';
import { DemoBanner } from '../shared/DemoBanner';
import { SETTING_LABEL, toothTitle } from '../../lib/present/labels';
import type { CaseInfo } from '../../lib/client/derive';
import { useChairside } from '../../lib/client/store';
import { BAR_ROW, ConelineMark } from './Shell';
import { SyncBadge } from './SyncBadge';

// Only the attending's decisions are news on the tablet; open and submitted it knows itself.
const REVIEW_WORD: Record<string, string | undefined> = {
  approved: 'approved by the attending',
  returned: 'returned for changes',
};

const BUTTON = 'min-h-14 min-w-14 px-3 rounded-lg border-2 border-ink bg-white leading-tight shrink-0';

/**
 * The Coneline mark, the tooth and setting, the sync state, and the way out, in one row on an
 * upright tablet (768 px); the demo line above them. The tooth is a toggle for its Universal
 * number, which saves a button's width in that row.
 */
export function TopBar(props: { info: CaseInfo | null; onCases: () => void; onSignOut: () => void }) {
  const user = useChairside((s) => s.identity.user);
  const showUniversal = useChairside((s) => s.showUniversal);
  const toggleUniversal = useChairside((s) => s.toggleUniversal);
  const demo = useChairside((s) => s.identity.demo);
  const review = useChairside((s) => (props.info ? s.reviews[props.info.caseId] : undefined));
  const info = props.info;
  const details = info
    ? [
        SETTING_LABEL[info.setting],
        info.tooth ? toothName(info.tooth) : '',
        info.chartRef ? `chart ${info.chartRef}` : '',
        review ? (REVIEW_WORD[review] ?? '') : '',
      ]
        .filter(Boolean)
        .join(' · ')
    : '';
  const label = info ? (
    <>
      <span className="block font-bold text-lg truncate">
        {info.tooth ? toothTitle(info.tooth, showUniversal ? fdiToUniversal(info.tooth) : undefined) : 'Block'}
      </span>
      <span className="block text-sm text-muted truncate">{details}</span>
    </>
  ) : null;
  return (
    <header className="bg-white border-b-2 border-line">
      {demo && <DemoBanner />}
      <div className={BAR_ROW} data-testid="top-bar">
        <ConelineMark />
        <div className="flex-1 min-w-0" data-testid="case-label">
          {info?.tooth ? (
            <button
              type="button"
              aria-pressed={showUniversal}
              aria-describedby="universal-hint"
              onClick={toggleUniversal}
              className="block max-w-full min-h-14 px-2 rounded-lg border-2 border-edge bg-white text-left"
            >
              {label}
              <span id="universal-hint" className="sr-only">
                Shows or hides the Universal number
              </span>
            </button>
          ) : (
            label && <p className="px-2">{label}</p>
          )}
        </div>
        <SyncBadge />
        {info && (
          <button type="button" onClick={props.onCases} className={`${BUTTON} font-bold`}>
            Cases
          </button>
        )}
        {user && (
          <button
            type="button"
            onClick={props.onSignOut}
            className={`${BUTTON} flex flex-col items-start justify-center`}
          >
            <span className="font-bold">Sign out</span> <span className="text-sm max-w-32 truncate">{user.name}</span>
          </button>
        )}
      </div>
    </header>
  );
}
