// @ts-check
// How the browser's scripts are cut into chunks, so that a page of its own (the calculators)
// costs the chairside's first paint nothing (docs/architecture.md, "Chairside budget").
//
// Rollup puts a module that two islands import into a chunk of its own, which both then
// load. Measured on this build: the calculators island importing the rules core and the ruler
// strip moved about 7 KB (gzipped) out of the chairside's chunk into shared chunks, and the
// chairside's first paint grew by 1.1 KB (0.5 KB for the rules core alone) — two files pack
// worse than one. Hence:
// - `ownCopies` gives the calculators island, the review islands (the queue's, and the case
//   page's comments and sign-off panel, all under components/review/) and the director's
//   settings island (components/admin/) their own copy of every module of ours they import (the
//   same source file under another module id, so nothing is written twice by hand); they may
//   share those copies with each other, never with the tablet;
// - `reactChunk` keeps React's own modules (react, react/jsx-runtime) in one chunk, which both
//   islands and the React renderer load anyway.
// The calculators browser test checks that the two pages share no script but React's.
import { fileURLToPath } from 'node:url';

const SRC = fileURLToPath(new URL('..', import.meta.url));
const COPY = '?island-copy';

/**
 * A Vite plugin: in the browser build, a module of `src/` imported from one of `islandDirs`
 * (or from one of its copies) is loaded as a copy of its own. Modules in those folders
 * themselves and packages are left alone.
 * @param {string[]} islandDirs folders of the islands, relative to src/
 * @returns {import('vite').Plugin}
 */
export function ownCopies(islandDirs = ['components/calculators/', 'components/review/', 'components/admin/']) {
  const islands = islandDirs.map((d) => SRC + d);
  /** @param {string} id */
  const inIsland = (id) => islands.some((dir) => id.startsWith(dir));
  return {
    name: 'coneline:own-copies',
    enforce: 'pre',
    apply: 'build',
    async resolveId(source, importer, options) {
      if (!importer || options.ssr || this.environment?.config.consumer === 'server') return null;
      if (!inIsland(importer) && !importer.endsWith(COPY)) return null;
      const resolved = await this.resolve(source, importer, { ...options, skipSelf: true });
      if (!resolved || resolved.external || resolved.id.includes('?')) return resolved;
      if (!resolved.id.startsWith(SRC) || inIsland(resolved.id)) return resolved;
      return { ...resolved, id: resolved.id + COPY };
    },
  };
}

/**
 * Rollup's manualChunks: React's own modules in one chunk named "react".
 * @param {string} id
 */
export function reactChunk(id) {
  return /[\\/]node_modules[\\/]react[\\/]/.test(id) ? 'react' : undefined;
}
