// @ts-check
import { defineConfig } from 'astro/config';
import node from '@astrojs/node';
import react from '@astrojs/react';
import tailwindcss from '@tailwindcss/vite';
import auth from 'auth-astro';
import { networkInterfaces } from 'node:os';
import { chairsidePwa } from './src/lib/pwa-config.mjs';
import { ownCopies, reactChunk } from './src/lib/island-chunks.mjs';

// This machine's own IPv4 addresses, so that a tablet on the local network (HTTPS=1 npm start)
// passes the origin check; scripts/start.ts rebuilds when they change.
const localAddresses = Object.values(networkInterfaces())
  .flat()
  .filter((n) => n && n.family === 'IPv4')
  .map((n) => /** @type {{ address: string }} */ (n).address)
  .sort();

export default defineConfig({
  output: 'server',
  // A second build folder (inside the project, so node_modules resolves from it, e.g.
  // dist-bench) lets a benchmark or an experiment build beside a running test suite.
  outDir: process.env.ASTRO_OUT_DIR ?? './dist',
  // scripts/server.mjs imports the adapter's handler and runs the server itself. Static
  // headers: /chairside is a static file, and its policy (with the hashes of its inline
  // scripts) must come as a header so that frame-ancestors counts.
  adapter: node({ mode: 'standalone', experimentalStaticHeaders: true }),
  // Our own /api/auth route reads and limits the body before Auth.js sees it.
  integrations: [react(), auth({ injectEndpoints: false }), chairsidePwa()],
  experimental: {
    // Astro hashes the hydration scripts, so script-src needs no 'unsafe-inline'.
    csp: {
      directives: [
        "default-src 'self'",
        "img-src 'self' data: blob:",
        "font-src 'self'",
        "connect-src 'self'",
        "worker-src 'self'",
        "manifest-src 'self'",
        "object-src 'none'",
        "base-uri 'self'",
        "form-action 'self'",
        "frame-ancestors 'none'",
      ],
    },
  },
  // Without allowedDomains Astro 5.18 ignores the Host header and its origin check
  // refuses same-origin form posts (the Auth.js sign-in included). See stack-notes.md.
  security: {
    checkOrigin: true,
    allowedDomains: [
      { hostname: 'localhost' },
      ...localAddresses.map((hostname) => ({ hostname })),
      ...(process.env.PUBLIC_HOST ? [{ hostname: process.env.PUBLIC_HOST }] : []),
    ],
  },
  server: { host: process.env.HOST ?? '127.0.0.1', port: Number(process.env.PORT ?? 4321) },
  vite: {
    // The calculators island and the review islands share no chunk with the chairside's but
    // React's (island-chunks.mjs).
    plugins: [tailwindcss(), ownCopies()],
    // Terser packs the tablet's scripts a few per cent tighter than the default minifier;
    // the chairside page has a 100 KB (gzipped) budget for all its JavaScript.
    build: {
      minify: 'terser',
      terserOptions: { compress: { passes: 2 } },
      // The chairside's later screens are dynamic imports whose own imports the page has
      // already loaded: no preload lists to carry in its first-paint budget.
      modulePreload: false,
      rollupOptions: { output: { manualChunks: reactChunk } },
    },
    // better-sqlite3 and argon2 are native: keep them out of the server bundle.
    ssr: { external: ['better-sqlite3', '@node-rs/argon2', 'knex'] },
  },
  devToolbar: { enabled: false },
});
