/**
 * Creates an account from the command line (the first director on a fresh install):
 *   npm run user:add -- --email E --name N --role student|attending|director --password P [--attending E] [--cohort NAME]
 */
import { parseArgs } from 'node:util';
import { resolve } from 'node:path';
import { ZodError } from 'zod';
import { openDb } from './lib/dbtasks.ts';
import { createUser, findUserByEmail, type NewUser } from '../src/lib/server/users.ts';

function fail(message: string): never {
  console.error(`user:add: ${message}`);
  process.exit(1);
}

let values;
try {
  ({ values } = parseArgs({
    options: {
      email: { type: 'string' }, name: { type: 'string' }, role: { type: 'string' }, password: { type: 'string' },
      attending: { type: 'string' }, cohort: { type: 'string' },
    },
    strict: true,
  }));
} catch (err) {
  fail((err as Error).message);
}
for (const key of ['email', 'name', 'role', 'password'] as const) {
  if (!values[key]) fail(`--${key} is required (usage: --email E --name N --role student|attending|director --password P [--attending E] [--cohort NAME])`);
}

const k = openDb(resolve(process.env.DB_FILE ?? 'data/coneline.sqlite'));
try {
  await k.migrate.latest();
  let cohortId: number | null = null;
  if (values.cohort) {
    const found = await k('cohorts').where({ name: values.cohort.trim() }).first();
    cohortId = found ? (found.id as number) : ((await k('cohorts').insert({ name: values.cohort.trim() }).returning('id'))[0] as { id: number }).id;
  }
  const attending = values.attending ? await findUserByEmail(k, values.attending) : undefined;
  if (values.attending && (!attending || attending.role !== 'attending')) fail(`--attending ${values.attending} is not an attending's account`);
  if (values.attending && values.role !== 'student') fail('--attending goes with --role student');
  const user = await createUser(k, {
    email: values.email!, name: values.name!, role: values.role as NewUser['role'], password: values.password!, cohortId,
  });
  if (attending) await k('assignments').insert({ attending_id: attending.id, student_id: user.id });
  console.log(`Created ${user.role} ${user.email}${attending ? `, assigned to ${attending.email}` : ''}.`);
} catch (err) {
  if (err instanceof ZodError) fail(err.issues.map((i) => i.message).join('; '));
  fail((err as Error).message);
} finally {
  await k.destroy();
}
