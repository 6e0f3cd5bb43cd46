// @ts-check
// The chairside service worker: precaches the prerendered /chairside shell, the /calculators
// page and their assets so the tablet opens them with no network after one visit
// (docs/architecture.md, "Offline").
// The island registers it with the browser's own API (src/lib/client/pwa.ts) and offers a reload
// when a new version waits ("prompt").
import AstroPWA from '@vite-pwa/astro';

export function chairsidePwa() {
  return AstroPWA({
    registerType: 'prompt',
    injectRegister: false,
    manifest: {
      id: '/chairside',
      name: 'Coneline chairside',
      short_name: 'Coneline',
      description: 'The obturation log on the operatory tray: canal by canal, one tap per length.',
      lang: 'en',
      start_url: '/chairside',
      scope: '/',
      display: 'standalone',
      orientation: 'any',
      background_color: '#F8F6F1',
      theme_color: '#17212E',
      categories: ['medical', 'education'],
      icons: [
        { src: '/icons/coneline-192.png', sizes: '192x192', type: 'image/png' },
        { src: '/icons/coneline-512.png', sizes: '512x512', type: 'image/png' },
        { src: '/icons/coneline-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
        { src: '/icons/coneline.svg', sizes: 'any', type: 'image/svg+xml' },
      ],
    },
    workbox: {
      // Only the chairside shell answers navigations offline; everything else is server-rendered.
      navigateFallback: '/chairside',
      navigateFallbackAllowlist: [/^\/chairside\/?$/],
      navigateFallbackDenylist: [/^\/api\//],
      // The manifest is precached by the plugin itself; listing it here would add it twice.
      // The calculators page is precached too: its exact path is answered from the precache
      // (no navigation fallback needed), and its scripts are among _astro/**.
      globPatterns: [
        'chairside/**/*.html',
        'calculators/**/*.html',
        '_astro/**/*.{js,css,woff2}',
        'icons/*.{png,svg}',
        'favicon.svg',
      ],
      // The director's settings island (react-hook-form and zod, about 29 KB gzipped) belongs to a
      // desktop page that is only used online: tablets need not download it.
      globIgnores: ['_astro/SettingsEditor.*.js'],
      cleanupOutdatedCaches: true,
      // Never cache API answers: they are personal and must come from the server or IndexedDB.
      runtimeCaching: [],
    },
  });
}
