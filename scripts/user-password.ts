/**
 * Sets a new password for an account from the command line: what a course director does for a
 * student who forgot theirs, until reset by e-mail exists. Every session of the account ends
 * and its sign-in holds are lifted. The password is asked for in a terminal, or read as one
 * line from standard input.
 */
import { parseArgs } from 'node:util';
import { openDb } from './lib/dbtasks.ts';
import { passwordFrom } from './lib/read-password.ts';
import { setPasswordFor } from '../src/lib/server/account.ts';
import { dataPaths } from '../src/lib/server/files.ts';

const USAGE = `usage: npm run user:password -- --email E [--password-stdin]
  The new password is asked for (not shown) when run in a terminal; --password-stdin reads it
  as one line from standard input instead. --password P is for scripts only: it shows the
  password in the process list and in the shell's history.`;

function fail(message: string): never {
  console.error(`user:password: ${message}`);
  process.exit(1);
}

function options() {
  try {
    return parseArgs({
      options: { email: { type: 'string' }, password: { type: 'string' }, 'password-stdin': { type: 'boolean' } },
      strict: true,
    }).values;
  } catch (err) {
    return fail(`${(err as Error).message}\n${USAGE}`);
  }
}

const values = options();
if (!values.email) fail(`--email is required\n${USAGE}`);
const secret = await passwordFrom(
  { password: values.password, stdin: values['password-stdin'] },
  fail,
  'nothing was changed',
);
const k = openDb(dataPaths().dbFile);
try {
  await k.migrate.latest();
  const { sessionsEnded, holdsLifted } = await setPasswordFor(k, values.email!, secret, null);
  console.log(
    `New password set for ${values.email!.trim().toLowerCase()}: ${sessionsEnded} session(s) ended, ${holdsLifted} sign-in hold(s) lifted.`,
  );
} catch (err) {
  fail((err as Error).message);
} finally {
  await k.destroy();
}
