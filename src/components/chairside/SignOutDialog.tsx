import { useEffect, useRef, useState } from 'react';
import { useChairside } from '../../lib/client/store';

/**
 * Signing out on a shared tablet: a last sync, then either a warning that unsent records
 * stay on the tablet (kept for this user's next sign-in), or a clean sign-out that clears
 * this user's local data.
 */
export function SignOutDialog({ onClose }: { onClose: () => void }) {
  const unsentBeforeSignOut = useChairside((s) => s.unsentBeforeSignOut);
  const leaveTablet = useChairside((s) => s.leaveTablet);
  const [unsent, setUnsent] = useState<number | null>(null);
  useEffect(() => {
    void unsentBeforeSignOut().then(setUnsent);
  }, [unsentBeforeSignOut]);
  const go = async () => {
    await leaveTablet();
    window.location.assign('/signout');
  };
  useEffect(() => {
    if (unsent === 0) void go();
  }, [unsent]); // eslint-disable-line react-hooks/exhaustive-deps
  // A modal dialog takes the focus, onto its safe answer, once that answer is on screen.
  const stay = useRef<HTMLButtonElement>(null);
  useEffect(() => stay.current?.focus(), [unsent]);
  return (
    <div
      role="dialog"
      aria-modal="true"
      aria-labelledby="signout-title"
      className="fixed inset-0 z-30 bg-ink/60 flex items-center justify-center p-4"
    >
      <div className="bg-white rounded-2xl p-5 max-w-lg">
        <h2 id="signout-title" className="text-2xl font-bold mb-2">
          Sign out
        </h2>
        {unsent === null || unsent === 0 ? (
          <p className="text-lg">Sending what is left…</p>
        ) : (
          <>
            <p className="text-lg mb-4" data-testid="unsent-warning">
              {unsent} record{unsent === 1 ? ' has' : 's have'} not reached the server yet.{' '}
              {unsent === 1 ? 'It stays' : 'They stay'} on this tablet, unsent, until you sign in here again.
            </p>
            <div className="flex flex-wrap gap-2">
              <button
                type="button"
                onClick={() => void go()}
                className="min-h-16 px-5 rounded-xl border-2 border-stop bg-white text-stop text-xl font-bold"
              >
                Sign out anyway
              </button>
              <button
                type="button"
                onClick={onClose}
                ref={stay}
                className="min-h-16 px-5 rounded-xl border-2 border-gutta-strong bg-gutta-strong text-white text-xl font-bold"
              >
                Stay signed in
              </button>
            </div>
          </>
        )}
      </div>
    </div>
  );
}
