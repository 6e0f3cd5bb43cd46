import { useEffect, useState } from 'react';
import { useChairside } from '../../lib/client/store';

function useOnline(): boolean {
  const [online, setOnline] = useState(typeof navigator === 'undefined' ? true : navigator.onLine);
  useEffect(() => {
    const on = () => setOnline(true);
    const off = () => setOnline(false);
    window.addEventListener('online', on);
    window.addEventListener('offline', off);
    return () => {
      window.removeEventListener('online', on);
      window.removeEventListener('offline', off);
    };
  }, []);
  return online;
}

/** The sync state, always on screen, with "Sync now". */
export function SyncBadge() {
  const rows = useChairside((s) => s.rows);
  const sync = useChairside((s) => s.sync);
  const signedOut = useChairside((s) => s.identity.signedOut);
  const syncNow = useChairside((s) => s.syncNow);
  const online = useOnline();
  const waiting = rows.filter((r) => r.state === 'queued').length;
  const rejected = rows.filter((r) => r.state === 'rejected').length;
  let text: string;
  let state: string;
  if (signedOut) {
    text = `signed out · ${waiting} waiting`;
    state = 'signed-out';
  } else if (!online || sync.phase === 'offline') {
    text = waiting ? `offline · ${waiting} saved on this tablet, waiting` : 'offline · nothing waiting';
    state = 'offline';
  } else if (sync.phase === 'syncing') {
    text = `syncing ${waiting}…`;
    state = 'syncing';
  } else if (sync.phase === 'other-user') {
    text = `another user is signed in · ${waiting} kept, not sent`;
    state = 'other-user';
  } else if (sync.phase === 'error') {
    text = `${waiting} waiting · sync failed, will retry`;
    state = 'error';
  } else if (waiting > 0) {
    text = `${waiting} waiting`;
    state = 'waiting';
  } else {
    text = 'all synced';
    state = 'synced';
  }
  return (
    <div className="flex items-center gap-2">
      <p
        role="status"
        aria-live="polite"
        data-testid="sync-state"
        data-state={state}
        data-waiting={waiting}
        className="text-base font-bold px-3 py-2 rounded-lg border-2 border-ink bg-paper tabular"
      >
        {text}
        {rejected > 0 ? ` · ${rejected} not accepted` : ''}
      </p>
      <button
        type="button"
        onClick={() => void syncNow()}
        disabled={!online}
        className="min-h-14 min-w-14 px-3 rounded-lg border-2 border-ink bg-white font-bold disabled:opacity-60"
      >
        Sync now
      </button>
    </div>
  );
}
