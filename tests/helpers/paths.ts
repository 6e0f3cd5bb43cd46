import { resolve } from 'node:path';
import { tmpdir } from 'node:os';

export const ROOT = resolve(import.meta.dirname, '../..');
export const ENTRY = resolve(ROOT, 'dist/server/entry.mjs');
/** The migrated, seeded database every server test starts from (made once per run). */
export const TEMPLATE_DB =
  process.env.CONELINE_TEMPLATE_DB ?? resolve(tmpdir(), `coneline-template-${process.pid}.sqlite`);
export const TSX = resolve(ROOT, 'node_modules/tsx/dist/cli.mjs');
