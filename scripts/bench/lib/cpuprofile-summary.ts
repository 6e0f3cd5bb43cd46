/**
 * Sums a V8 .cpuprofile's self time by function and by file (or package), largest first,
 * and the inclusive time of a few call sites worth watching.
 *   npx tsx scripts/bench/lib/cpuprofile-summary.ts /tmp/prof/CPU.….cpuprofile [rows]
 */
import { readFileSync } from 'node:fs';

interface Node {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  children?: number[];
}
interface Profile {
  nodes: Node[];
  samples: number[];
  timeDeltas: number[];
}

const [file, rowsArg] = process.argv.slice(2);
if (!file) throw new Error('usage: cpuprofile-summary.ts FILE.cpuprofile [rows]');
const rows = Number(rowsArg ?? 30);
const profile = JSON.parse(readFileSync(file, 'utf8')) as Profile;
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
const self = new Map<number, number>();
profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0)));
const total = [...self.values()].reduce((a, b) => a + b, 0);

/** node_modules/PKG (or @scope/PKG), dist/… chunk, node: built-in, or the V8 pseudo-frame. */
function place(url: string): string {
  if (!url) return '(native/V8)';
  const nm = url.lastIndexOf('node_modules/');
  if (nm >= 0) {
    const rest = url.slice(nm + 13).split('/');
    return rest[0]!.startsWith('@') ? `${rest[0]}/${rest[1]}` : rest[0]!;
  }
  const dist = url.indexOf('/dist/');
  if (dist >= 0) return url.slice(dist + 1);
  return url.replace(/^file:\/\/.*\/(scripts|src)\//, '$1/');
}

function table(title: string, sums: Map<string, number>): void {
  console.log(`\n${title} (of ${(total / 1000).toFixed(0)} ms sampled)`);
  for (const [k, v] of [...sums].sort((a, b) => b[1] - a[1]).slice(0, rows))
    console.log(`${((100 * v) / total).toFixed(1).padStart(5)}%  ${(v / 1000).toFixed(0).padStart(6)} ms  ${k}`);
}

const fn = new Map<string, number>();
const where = new Map<string, number>();
for (const [id, t] of self) {
  const { functionName, url, lineNumber } = byId.get(id)!.callFrame;
  const k = `${functionName || '(anonymous)'} ${place(url)}:${lineNumber + 1}`;
  fn.set(k, (fn.get(k) ?? 0) + t);
  where.set(place(url), (where.get(place(url)) ?? 0) + t);
}
table('self time by function', fn);
table('self time by file or package', where);

// Inclusive time of named functions (each sample counted once per function name on its stack).
const watch = (process.env.WATCH ?? '').split(',').filter(Boolean);
if (watch.length > 0) {
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const incl = new Map<string, number>();
  for (const [id, t] of self) {
    const seen = new Set<string>();
    for (let cur: number | undefined = id; cur !== undefined; cur = parent.get(cur)) {
      const name = byId.get(cur)!.callFrame.functionName;
      if (watch.includes(name) && !seen.has(name)) {
        seen.add(name);
        incl.set(name, (incl.get(name) ?? 0) + t);
      }
    }
  }
  table('inclusive time of watched functions', incl);
}
