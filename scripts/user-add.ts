/**
 * Creates an account from the command line (the first director on a fresh install). The
 * password is asked for in a terminal, or read as one line from standard input.
 */
import { parseArgs } from 'node:util';
import { ZodError } from 'zod';
import { openDb } from './lib/dbtasks.ts';
import { passwordFrom } from './lib/read-password.ts';
import { dataPaths } from '../src/lib/server/files.ts';
import { createUser, findUserByEmail, type NewUser } from '../src/lib/server/users.ts';

const USAGE = `usage: npm run user:add -- --email E --name N --role student|attending|director [--attending E] [--cohort NAME]
  The password is asked for (not shown) when run in a terminal; --password-stdin reads it as
  one line from standard input instead. --password P is for scripts only: it shows the
  password in the process list to every user of the machine, and in the shell's history.`;

function fail(message: string): never {
  console.error(`user:add: ${message}`);
  process.exit(1);
}

function options() {
  try {
    return parseArgs({
      options: {
        email: { type: 'string' },
        name: { type: 'string' },
        role: { type: 'string' },
        password: { type: 'string' },
        'password-stdin': { type: 'boolean' },
        attending: { type: 'string' },
        cohort: { type: 'string' },
      },
      strict: true,
    }).values;
  } catch (err) {
    return fail(`${(err as Error).message}\n${USAGE}`);
  }
}

const values = options();
for (const key of ['email', 'name', 'role'] as const) {
  if (!values[key]) fail(`--${key} is required\n${USAGE}`);
}

const secret = await passwordFrom(
  { password: values.password, stdin: values['password-stdin'] },
  fail,
  'nothing was created',
);
const k = openDb(dataPaths().dbFile);
try {
  await k.migrate.latest();
  let cohortId: number | null = null;
  if (values.cohort) {
    const found = await k('cohorts').where({ name: values.cohort.trim() }).first();
    cohortId = found
      ? (found.id as number)
      : ((await k('cohorts').insert({ name: values.cohort.trim() }).returning('id'))[0] as { id: number }).id;
  }
  const attending = values.attending ? await findUserByEmail(k, values.attending) : undefined;
  if (values.attending && (!attending || attending.role !== 'attending'))
    fail(`--attending ${values.attending} is not an attending's account`);
  if (values.attending && values.role !== 'student') fail('--attending goes with --role student');
  const user = await createUser(k, {
    email: values.email!,
    name: values.name!,
    role: values.role as NewUser['role'],
    password: secret,
    cohortId,
  });
  if (attending) await k('assignments').insert({ attending_id: attending.id, student_id: user.id });
  console.log(`Created ${user.role} ${user.email}${attending ? `, assigned to ${attending.email}` : ''}.`);
} catch (err) {
  if (err instanceof ZodError) fail(err.issues.map((i) => i.message).join('; '));
  fail((err as Error).message);
} finally {
  await k.destroy();
}
