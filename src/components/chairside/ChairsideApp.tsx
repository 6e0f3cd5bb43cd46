import { lazy, Suspense, useEffect, useLayoutEffect, useState } from 'react';
import { useChairside } from '../../lib/client/store';
import { StepCard } from './AnswerButtons';
import { CaseList } from './CaseList';
import { CaseView } from './CaseView';
import { Later } from './Later';
import { SafetyNote, SHELL_ID } from './Shell';
import { TopBar } from './TopBar';
import { UndoStrip } from './UndoStrip';

// Screens used once per case or per session load when first opened, so the first paint and
// the open card keep within their budget (docs/architecture.md, "Chairside budget"). Every
// chunk is precached, so they open offline too.
const OpenCase = lazy(() => import('./OpenCase').then((m) => ({ default: m.OpenCase })));
const RejectedList = lazy(() => import('./RejectedList').then((m) => ({ default: m.RejectedList })));
const SignOutDialog = lazy(() => import('./SignOutDialog').then((m) => ({ default: m.SignOutDialog })));

/** The chairside island: who is working, which case, and the canal stepper. */
export default function ChairsideApp() {
  const phase = useChairside((s) => s.phase);
  const identity = useChairside((s) => s.identity);
  const caseId = useChairside((s) => s.caseId);
  const tablet = useChairside((s) => s.tablet);
  const error = useChairside((s) => s.error);
  const persistence = useChairside((s) => s.persistence);
  // Rare, so its list loads only when there is something to show.
  const anyRejected = useChairside((s) =>
    s.rows.some((r) => r.state === 'rejected' && (!s.caseId || r.event.caseId === s.caseId)),
  );
  const openCase = useChairside((s) => s.openCase);
  const [creating, setCreating] = useState(false);
  const [signingOut, setSigningOut] = useState(false);
  const [update, setUpdate] = useState<null | (() => void)>(null);

  useEffect(() => {
    void useChairside.getState().init();
    // The worker's registration loads on its own: nothing on the first screen waits for it.
    void import('../../lib/client/pwa').then((m) => m.registerServiceWorker((accept) => setUpdate(() => accept)));
  }, []);

  const info = tablet.caseId === caseId ? tablet.info : null;
  // Opening the new case ends "creating": leaving it later (a discard) goes back to the list.
  // Adjusted while rendering, as React advises for state that follows a prop, not in an effect.
  const [caseSeen, setCaseSeen] = useState(caseId);
  if (caseId !== caseSeen) {
    setCaseSeen(caseId);
    if (caseId) setCreating(false);
  }

  // The page was served with a static shell (src/pages/chairside.astro): it stays until the
  // tablet's log is open, and goes in the same frame as this island's first screen appears.
  useLayoutEffect(() => {
    if (phase !== 'loading') document.getElementById(SHELL_ID)?.remove();
  }, [phase]);
  if (phase === 'loading') return null;

  let body;
  if (!identity.user) {
    body = (
      <StepCard
        title={identity.signedOut ? 'Sign in to record' : 'Sign in first'}
        hint={
          identity.signedOut
            ? 'Nobody is signed in on this tablet.'
            : 'Sign in once while online; after that the tablet works offline as you.'
        }
      >
        <a
          href="/signin?callbackUrl=/chairside"
          className="inline-flex items-center min-h-16 px-5 rounded-xl border-2 border-gutta-strong bg-gutta-strong text-white text-xl font-bold"
        >
          Sign in
        </a>
      </StepCard>
    );
  } else if (identity.user.role !== 'student') {
    body = (
      <StepCard title="Chairside is for students" hint="Attendings and directors review cases on the desktop pages.">
        <a className="underline text-lg" href="/">
          Home
        </a>
      </StepCard>
    );
  } else if (creating && !caseId)
    body = (
      <Later>
        <OpenCase onCancel={() => setCreating(false)} />
      </Later>
    );
  else if (!caseId || !info || info.discarded) body = <CaseList onNew={() => setCreating(true)} />;
  else body = <CaseView key={caseId} info={info} tablet={tablet} />;

  return (
    <div className="min-h-screen flex flex-col">
      <TopBar
        info={info}
        onCases={() => {
          setCreating(false);
          openCase(null);
        }}
        onSignOut={() => setSigningOut(true)}
      />
      <SafetyNote />
      {update && (
        <div className="bg-note text-white px-4 py-2 flex items-center gap-4" role="status">
          <p className="text-lg">A new version of Coneline is ready.</p>
          <button
            type="button"
            onClick={update}
            className="min-h-14 min-w-14 px-4 rounded-lg border-2 border-white font-bold"
          >
            Reload
          </button>
        </div>
      )}
      {identity.signedOut && identity.user && (
        <p className="bg-white border-b-2 border-stop px-4 py-2 text-lg" role="alert">
          Your session has ended: what you record stays on this tablet.{' '}
          <a className="underline font-bold" href="/signin?callbackUrl=/chairside">
            Sign in again
          </a>{' '}
          to send it.
        </p>
      )}
      <main id="main" className="flex-1 flex flex-col pb-28">
        {error && (
          <p role="alert" className="mx-3 mt-3 p-3 border-2 border-stop bg-white text-stop font-bold">
            {error}
          </p>
        )}
        <div className="p-3">{body}</div>
        {/* Below the screen's own content, so that what arrives late moves nothing on screen. */}
        <div className="mt-auto">
          {anyRejected && (
            <Suspense fallback={null}>
              <RejectedList caseId={caseId} />
            </Suspense>
          )}
          {persistence === 'refused' && identity.user && (
            <p className="mx-3 text-sm border-l-4 border-caution pl-3" data-testid="storage-note">
              This browser may clear records not yet sent if the tablet runs short of storage: sync soon.
            </p>
          )}
        </div>
      </main>
      {signingOut && (
        <Suspense fallback={null}>
          <SignOutDialog onClose={() => setSigningOut(false)} />
        </Suspense>
      )}
      <UndoStrip />
    </div>
  );
}
