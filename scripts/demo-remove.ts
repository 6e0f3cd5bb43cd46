/**
 * `npm run demo:remove`: takes the invented demo clinic out of DB_FILE in one transaction and
 * says what it removed. Running it again removes nothing. A running server notices within
 * seconds (it keeps "demo mode" for a few seconds only) and drops the demo banner.
 */
import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { openDb } from './lib/dbtasks.ts';
import { DemoRemovalBlocked, removeDemo, type DemoRemoval } from '../src/lib/server/demo.ts';

const LABELS: [keyof DemoRemoval, string, string][] = [
  ['accounts', 'account', 'accounts'],
  ['cohorts', 'cohort', 'cohorts'],
  ['cases', 'case', 'cases'],
  ['canals', 'canal', 'canals'],
  ['events', 'event', 'events'],
  ['findings', 'finding', 'findings'],
  ['radiographs', 'radiograph record', 'radiograph records'],
  ['signoffs', 'sign-off', 'sign-offs'],
  ['comments', 'comment', 'comments'],
  ['assignments', 'assignment', 'assignments'],
  ['sessions', 'session', 'sessions'],
  ['invitations', 'invitation', 'invitations'],
];

/** "6 accounts, 1 cohort, …", leaving out what there was none of. */
function describeRemoval(r: DemoRemoval): string {
  return LABELS.filter(([key]) => r[key] > 0)
    .map(([key, one, many]) => `${r[key]} ${r[key] === 1 ? one : many}`)
    .join(', ');
}

const file = resolve(process.env.DB_FILE ?? 'data/coneline.sqlite');
if (!existsSync(file)) {
  // Opening it would make an empty database: there is nothing to remove from one.
  console.log(`demo:remove: there is no database at ${file}; nothing removed.`);
  process.exit(0);
}
const k = openDb(file);
try {
  await k.migrate.latest();
  const removed = await removeDemo(k);
  if (removed.accounts + removed.cohorts === 0) {
    console.log(`demo:remove: no demo clinic in ${file}; nothing removed.`);
  } else {
    console.log(`demo:remove: removed the demo clinic from ${file}: ${describeRemoval(removed)}.`);
    if (removed.auditLinesKept > 0)
      console.log(
        `Kept ${removed.auditLinesKept} audit line${removed.auditLinesKept === 1 ? '' : 's'} that named a demo account as actor, now with no actor.`,
      );
  }
} catch (err) {
  const reason = err instanceof DemoRemovalBlocked ? `${err.message}. Nothing was removed.` : (err as Error).message;
  console.error(`demo:remove: ${reason}`);
  process.exitCode = 1;
} finally {
  await k.destroy();
}
