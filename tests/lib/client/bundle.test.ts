// The chairside island's JavaScript budget (≤ 100 KB gzipped, React's ~67 KB included) has no
// room for zod 3 (~14 KB): the client reads events with the rules core's zod-free entry
// (rules/core.ts). Bundling the island shows an import of rules/index or zod at once.
import { describe, expect, it } from 'vitest';

describe('the chairside island', () => {
  it('bundles without zod', async () => {
    const { build } = await import('esbuild');
    const out = await build({
      entryPoints: [new URL('../../../src/components/chairside/ChairsideApp.tsx', import.meta.url).pathname],
      bundle: true,
      platform: 'browser',
      format: 'esm',
      jsx: 'automatic',
      write: false,
      metafile: true,
      logLevel: 'silent',
      external: ['react', 'react-dom', 'react/*', 'react-dom/*'],
    });
    const inputs = Object.keys(out.metafile.inputs);
    expect(inputs.some((p) => p.endsWith('src/lib/rules/parse.ts'))).toBe(true);
    expect(
      inputs.filter(
        (p) =>
          p.includes('node_modules/zod/') ||
          p.endsWith('src/lib/rules/schema.ts') ||
          p.endsWith('src/lib/rules/errors.ts'),
      ),
    ).toEqual([]);
  });
});
