/**
 * Signing out, for the sign-out page (pages never open the database). Kept apart from
 * sessions.ts, which command-line tools import and which must not load the server's db().
 */
import { audit } from './audit';
import { db } from './db';
import { endAllSessions, endSession } from './sessions';

/** Signs out of this session, or of every session of the user, with its audit line. */
export async function signOut(userId: number, sessionId: string, everywhere: boolean): Promise<void> {
  const k = await db();
  await k.transaction(async (trx) => {
    if (everywhere) await endAllSessions(trx, userId, 'sign-out-everywhere');
    else await endSession(trx, sessionId, 'sign-out');
    await audit(trx, userId, everywhere ? 'user.signed-out-everywhere' : 'user.signed-out', 'user', String(userId));
  });
}
