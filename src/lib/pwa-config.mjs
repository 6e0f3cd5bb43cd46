// @ts-check
// The chairside service worker: precaches the prerendered /chairside shell and its assets
// so the tablet opens it with no network after one visit (stack-notes.md, "Offline-first").
import AstroPWA from '@vite-pwa/astro';

export function chairsidePwa() {
  return AstroPWA({
    registerType: 'prompt',
    injectRegister: false,
    manifest: {
      name: 'Coneline chairside',
      short_name: 'Coneline',
      description: 'Chairside obturation log for endodontic teaching clinics',
      start_url: '/chairside',
      scope: '/',
      display: 'standalone',
      background_color: '#F8F6F1',
      theme_color: '#17212E',
      icons: [
        { src: '/icons/coneline-192.png', sizes: '192x192', type: 'image/png' },
        { src: '/icons/coneline-512.png', sizes: '512x512', type: 'image/png' },
        { src: '/icons/coneline-maskable-512.png', sizes: '512x512', type: 'image/png', purpose: 'maskable' },
      ],
    },
    workbox: {
      navigateFallback: '/chairside',
      navigateFallbackAllowlist: [/^\/chairside/],
      navigateFallbackDenylist: [/^\/api\//],
      globPatterns: ['**/*.{js,css,html,woff2,svg,png,ico}'],
      cleanupOutdatedCaches: true,
    },
  });
}
