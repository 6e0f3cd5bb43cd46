// The contract module: event data typed per type (checked by the type checker, which
// `npm test` runs), version gating, and roles spelled once.
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { describe, expect, expectTypeOf, it } from 'vitest';
import {
  CONTRACT_VERSION,
  EVENT_TYPE_SINCE,
  EVENT_TYPES,
  ROLES,
  serverKnows,
  type EventData,
  type SyncAnswer,
} from '../../src/lib/contract';
import { ROOT } from '../helpers/paths';

describe('EventData', () => {
  it('types each event type’s data, so a misspelt field does not compile', () => {
    expectTypeOf<EventData<'spreader.placed'>>().toEqualTypeOf<{ spreader: string; depthMm: number }>();
    expectTypeOf<EventData<'gp.compacted'>>().toEqualTypeOf<Record<never, never>>();
    // @ts-expect-error depthMn is not a field of spreader.placed
    const misspelt: EventData<'spreader.placed'> = { spreader: 'MF', depthMn: 19 };
    // @ts-expect-error a sealer outside the contract's list
    const unknownSealer: EventData<'master.seated'> = { sealer: 'glue' };
    expect([misspelt, unknownSealer]).toHaveLength(2);
  });

  it('types the sync answer with the contract version', () => {
    expectTypeOf<SyncAnswer['contractVersion']>().toEqualTypeOf<number>();
  });
});

describe('serverKnows', () => {
  it('names a version for every event type, none newer than the contract', () => {
    for (const t of EVENT_TYPES) {
      expect(EVENT_TYPE_SINCE[t]).toBeGreaterThanOrEqual(1);
      expect(EVENT_TYPE_SINCE[t]).toBeLessThanOrEqual(CONTRACT_VERSION);
    }
  });

  it('lets a tablet record a type only when the server’s version has it', () => {
    expect(serverKnows('spreader.placed', CONTRACT_VERSION)).toBe(true);
    expect(serverKnows('spreader.placed', 0)).toBe(false);
  });
});

/** Every source file under `dir`. */
function files(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name);
    return statSync(full).isDirectory() ? files(full) : [full];
  });
}

describe('one spelling of the contract', () => {
  it('spells the roles in the contract module only', () => {
    expect(ROLES).toEqual(['student', 'attending', 'director']);
    const spelt = files(resolve(ROOT, 'src')).filter((f) =>
      /['"]student['"]\s*\|\s*['"]attending['"]\s*\|\s*['"]director['"]|\[\s*'student',\s*'attending',\s*'director'\s*\]/.test(
        readFileSync(f, 'utf8'),
      ),
    );
    expect(spelt.map((f) => f.slice(ROOT.length + 1))).toEqual(['src/lib/contract.ts']);
  });

  it('lets no page or component open the database: they call services', () => {
    const ui = [...files(resolve(ROOT, 'src/pages')), ...files(resolve(ROOT, 'src/components'))].filter((f) =>
      /\.(astro|tsx)$/.test(f),
    );
    const opening = ui.filter((f) => /lib\/server\/db['"]|from ['"]knex['"]/.test(readFileSync(f, 'utf8')));
    expect(opening.map((f) => f.slice(ROOT.length + 1))).toEqual([]);
  });
});
