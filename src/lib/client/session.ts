import { fetchMe, type Me } from './api';
import { newDeviceId } from './ids';
import { clearUserIfSynced, delMeta, getMeta, setMeta } from './outbox';

/** Who the island works as, and how it knows. */
export interface Identity {
  user: Me | null;
  /** `server`: /api/me answered; `tablet`: offline, the last user kept on this tablet. */
  source: 'server' | 'tablet' | null;
  /** The server answered 401: nobody is signed in. */
  signedOut: boolean;
  /** The installation is in demo mode: as /api/me last said, so it shows offline too. */
  demo: boolean;
  /** The contract version the server last reported (kept offline too); 1 before it reported one. */
  serverContract: number;
}

const LAST_USER = 'lastUser';
// Kept apart from the user and through sign-outs: it describes the server, not a person, and
// the tablet learns it only from a signed-in answer of /api/me.
const DEMO_MODE = 'demoMode';
const SERVER_CONTRACT = 'serverContract';

/** This browser's own device id, made once. */
export async function deviceId(): Promise<string> {
  const known = await getMeta<string>('deviceId');
  if (known) return known;
  const id = newDeviceId();
  await setMeta('deviceId', id);
  return id;
}

/**
 * Ask the server who is signed in; offline, go on as the last user this tablet saw.
 * A tablet is shared: when someone else (or nobody) is signed in, the previous user's data
 * is cleared if all of it reached the server, and kept untouched otherwise.
 */
export async function resolveIdentity(): Promise<Identity> {
  const last = await getMeta<Me>(LAST_USER);
  const me = await fetchMe();
  if (me.kind === 'ok') {
    const { id, name, role, clinic, attendings, requireConeFitApproval } = me.value;
    const demo = me.value.demo === true;
    if (last && last.id !== id) await clearUserIfSynced(last.id);
    const user: Me = { id, name, role, clinic, attendings, requireConeFitApproval };
    await setMeta(LAST_USER, user);
    await setMeta(DEMO_MODE, demo);
    // A server from before the contract had a version reports none: it knows version 1.
    const serverContract = typeof me.value.contractVersion === 'number' ? me.value.contractVersion : 1;
    await setMeta(SERVER_CONTRACT, serverContract);
    return { user, source: 'server', signedOut: false, demo, serverContract };
  }
  const demo = (await getMeta<boolean>(DEMO_MODE)) === true;
  const serverContract = (await getMeta<number>(SERVER_CONTRACT)) ?? 1;
  if (me.kind === 'status' && me.status === 401) {
    if (last) await clearUserIfSynced(last.id);
    // Offline later, nobody should record under a user who has signed out.
    await delMeta(LAST_USER);
    return { user: null, source: null, signedOut: true, demo, serverContract };
  }
  return last
    ? { user: last, source: 'tablet', signedOut: false, demo, serverContract }
    : { user: null, source: null, signedOut: false, demo, serverContract };
}

/** After a sign-out anywhere in this browser: nobody works offline as that user any more. */
export function forgetLastUser(): Promise<void> {
  return delMeta(LAST_USER);
}

/**
 * Prepare to sign out: forget the user as "the one working offline" and clear their data
 * when nothing is left to send. Returns the number of unsent events kept on the tablet.
 */
export async function leave(userId: number, unsent: number): Promise<number> {
  await delMeta(LAST_USER);
  if (unsent === 0) {
    const cleared = await clearUserIfSynced(userId);
    if (!cleared) return 1;
  }
  return unsent;
}
