import { useEffect, useState } from 'react';
import type { CanalResult, CaseSummary, ReviewComment, Signoff } from '../../lib/contract';
import { fetchNews, landingCanal, readNews, standingReturn, useNews, type CaseNews } from '../../lib/client/news';
import { setMeta } from '../../lib/client/outbox';
import { useChairside } from '../../lib/client/store';
import { DEFAULT_CLINIC, formatInstant, type Clinic } from '../../lib/present/format';
import { canalTitle, roleLabel } from '../../lib/present/labels';
import {
  CHECKPOINT_LABEL,
  RATING_KEY_LABEL,
  RATING_LEVEL_LABEL,
  SIGNOFF_OUTCOME_LABEL,
} from '../../lib/present/review';

// What the attending said, on the tablet: the "came back" mark on the case list and the
// sign-offs and comments of the open case. Loaded on first use (see ChairsideApp), never with
// the first paint.

/** "Cone fit of canal D", "Fill check of canal MB", "The whole case". */
function whatOf(s: Signoff, names: Record<string, string>): string {
  if (s.checkpoint === 'final' || !s.canalId) return 'The whole case';
  const name = names[s.canalId];
  return `${CHECKPOINT_LABEL[s.checkpoint]}${name ? `, ${canalTitle(name)}` : ''}`;
}

/** One return, as the case list and the case show it. */
function ReturnLine({ s, names, clinic }: { s: Signoff; names: Record<string, string>; clinic: Clinic }) {
  return (
    <p className="text-base" data-testid="return-comment">
      <span className="font-bold">
        {whatOf(s, names)} came back from {s.attendingName}, {formatInstant(s.at, clinic)}:
      </span>{' '}
      {s.comment}
    </p>
  );
}

/** The canal names of the tablet's copy of a case, by canal id (for the words "canal D"). */
function useCanalNames(caseId: string): Record<string, string> {
  const server = useChairside((s) => s.server);
  const names: Record<string, string> = {};
  for (const c of Object.values(server)) if (c.result.caseId === caseId) names[c.result.canalId] = c.result.state.name;
  return names;
}

/**
 * The "came back" mark of a case on the case list: shown when the server says the case was
 * returned (the list's answer, or the tablet's last pull), with the return's comment, and it
 * tells the store where the case opens (the canal the return names, or the first with a stop).
 */
export function CameBack({ caseId, remote }: { caseId: string; remote: CaseSummary[] }) {
  const userId = useChairside((s) => s.identity.user?.id);
  const known = useChairside((s) => s.reviews[caseId]);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  const names = useCanalNames(caseId);
  const status = remote.find((c) => c.caseId === caseId)?.reviewStatus ?? known;
  const [news, setNews] = useState<CaseNews | undefined>();
  const returned = status === 'returned';

  useEffect(() => {
    if (!returned || userId === undefined) return;
    let live = true;
    const land = (n: CaseNews | undefined, canals: CanalResult[]) => {
      const canal = landingCanal(
        n,
        canals.filter((c) => c.caseId === caseId),
      );
      const s = useChairside.getState();
      if (canal) useChairside.setState({ landing: { ...s.landing, [caseId]: canal } });
      // The tablet learns of the return here too, so the case opens unlocked (ReviewLock).
      if (s.reviews[caseId] !== 'returned') {
        const reviews = { ...s.reviews, [caseId]: 'returned' as const };
        useChairside.setState({ reviews });
        void setMeta([userId, 'reviews'], reviews);
      }
    };
    void readNews(userId, caseId).then(async (kept) => {
      if (!live) return;
      setNews(kept);
      land(
        kept,
        Object.values(useChairside.getState().server).map((c) => c.result),
      );
      const fresh = navigator.onLine ? await fetchNews(userId, caseId) : undefined;
      if (!live || !fresh) return;
      setNews(fresh.news);
      land(fresh.news, fresh.canals);
    });
    return () => {
      live = false;
    };
  }, [returned, userId, caseId]);

  if (!returned) return null;
  const back = standingReturn(news);
  return (
    <div className="basis-full border-l-4 border-stop pl-3" data-testid="came-back">
      <p className="text-lg font-bold text-stop">Came back from your attending</p>
      {back ? (
        <ReturnLine s={back} names={names} clinic={clinic} />
      ) : (
        <p className="text-base">Open it to read why; the comment reaches this tablet once it is online.</p>
      )}
    </div>
  );
}

function Ratings({ ratings, names }: { ratings: Signoff['ratings']; names: Record<string, string> }) {
  if (!ratings) return null;
  return (
    <ul className="text-base">
      {Object.entries(ratings).map(([canalId, r]) => (
        <li key={canalId}>
          {names[canalId] ? `${canalTitle(names[canalId])}: ` : ''}
          {Object.entries(r)
            .map(([k, v]) => `${RATING_KEY_LABEL[k as keyof typeof RATING_KEY_LABEL]} ${RATING_LEVEL_LABEL[v as 1]}`)
            .join(' · ')}
        </li>
      ))}
    </ul>
  );
}

type Item = { at: string; signoff: Signoff } | { at: string; comment: ReviewComment };

/** Every sign-off and comment of the open case, newest first: what the attending said, and the student's answers. */
export function CaseNewsPanel({ caseId }: { caseId: string }) {
  const news = useNews(caseId);
  const clinic = useChairside((s) => s.identity.user?.clinic) ?? DEFAULT_CLINIC;
  const names = useCanalNames(caseId);
  const items: Item[] = [
    ...(news?.signoffs ?? []).map((signoff) => ({ at: signoff.at, signoff })),
    ...(news?.comments ?? []).map((comment) => ({ at: comment.at, comment })),
  ].sort((a, b) => Date.parse(b.at) - Date.parse(a.at));
  if (items.length === 0) return null;
  return (
    <section
      aria-labelledby="case-news-title"
      className="mt-4 bg-white rounded-2xl border-2 border-line p-4"
      data-testid="case-news"
    >
      <h2 id="case-news-title" className="text-xl font-bold mb-2">
        From your attending
      </h2>
      <ul className="flex flex-col gap-3">
        {items.map((it, i) =>
          'signoff' in it ? (
            <li key={`s${i}`} className="border-l-4 border-gutta pl-3" data-testid="news-signoff">
              <p className="text-base">
                <span className="font-bold">
                  {whatOf(it.signoff, names)}: {SIGNOFF_OUTCOME_LABEL[it.signoff.decision]}
                </span>{' '}
                by {it.signoff.attendingName}, {formatInstant(it.at, clinic)}
                {it.signoff.supersededAt ? ' (since reopened)' : ''}
              </p>
              {it.signoff.comment && <p className="text-base">{it.signoff.comment}</p>}
              <Ratings ratings={it.signoff.ratings} names={names} />
            </li>
          ) : (
            <li key={`c${i}`} className="border-l-4 border-line pl-3" data-testid="news-comment">
              <p className="text-base">
                <span className="font-bold">
                  {it.comment.authorName} ({roleLabel(it.comment.authorRole)})
                  {it.comment.canalId && names[it.comment.canalId]
                    ? `, on the ${canalTitle(names[it.comment.canalId]!)}`
                    : ''}
                </span>
                , {formatInstant(it.at, clinic)}
              </p>
              <p className="text-base">{it.comment.text}</p>
            </li>
          ),
        )}
      </ul>
    </section>
  );
}
