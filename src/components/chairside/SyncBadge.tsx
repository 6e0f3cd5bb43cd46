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

/**
 * The sync state, always on screen, in two short lines of a fixed width (so the top bar
 * keeps one row and nothing beside it moves when the state changes), with "Sync now".
 */
export function SyncBadge() {
  const rows = useChairside((s) => s.rows);
  const sync = useChairside((s) => s.sync);
  const signedOut = useChairside((s) => s.identity.signedOut);
  const syncNow = useChairside((s) => s.syncNow);
  const online = useOnline();
  const waiting = rows.filter((r) => r.state === 'queued').length;
  const rejected = rows.filter((r) => r.state === 'rejected').length;
  let head: string;
  let detail: string;
  let state: string;
  if (signedOut) {
    [head, detail, state] = ['signed out', `${waiting} waiting`, 'signed-out'];
  } else if (!online || sync.phase === 'offline') {
    [head, detail, state] = ['offline', waiting ? `${waiting} saved on this tablet` : 'nothing waiting', 'offline'];
  } else if (sync.phase === 'syncing') {
    [head, detail, state] = ['syncing…', `${waiting} waiting`, 'syncing'];
  } else if (sync.phase === 'other-user') {
    [head, detail, state] = ['another user', `${waiting} kept, not sent`, 'other-user'];
  } else if (sync.phase === 'error') {
    [head, detail, state] = ['sync failed', `${waiting} waiting, will retry`, 'error'];
  } else if (waiting > 0) {
    [head, detail, state] = [`${waiting} waiting`, 'saved on this tablet', 'waiting'];
  } else {
    [head, detail, state] = ['all synced', 'nothing waiting', 'synced'];
  }
  if (rejected > 0) detail = `${rejected} not accepted`;
  return (
    <div className="flex items-center gap-2 shrink-0">
      <p
        role="status"
        aria-live="polite"
        data-testid="sync-state"
        data-state={state}
        data-waiting={waiting}
        className="w-40 px-2 py-1 rounded-lg border-2 border-ink bg-paper tabular leading-tight"
      >
        <span className="block font-bold truncate">{head}</span>
        <span className="block text-sm truncate">{detail}</span>
      </p>
      <button
        type="button"
        onClick={() => void syncNow()}
        disabled={!online}
        aria-label="Sync now"
        className="min-h-14 min-w-14 px-2 rounded-lg border-2 border-ink bg-white font-bold leading-tight disabled:opacity-60"
      >
        Sync
        <br />
        now
      </button>
    </div>
  );
}
