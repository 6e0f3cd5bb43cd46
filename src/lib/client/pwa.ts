import type { Workbox } from 'workbox-window';

/**
 * Register the service worker (built by @vite-pwa/astro with registerType "prompt") and
 * tell the island when a new version is waiting; `accept()` activates it and reloads.
 * workbox-window is loaded by dynamic import after the island has rendered: no tap needs it,
 * so it stays out of the first paint's budget (docs/architecture.md, "Chairside budget").
 */
export function registerServiceWorker(onUpdate: (accept: () => void) => void): void {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return;
  void import('workbox-window')
    .then(({ Workbox }) => start(new Workbox('/sw.js', { scope: '/' }), onUpdate))
    .catch(() => {
      // Not loaded (offline before the first precache): the island works online, and the next visit registers.
    });
}

function start(wb: Workbox, onUpdate: (accept: () => void) => void): void {
  wb.addEventListener('waiting', () => {
    onUpdate(() => {
      wb.addEventListener('controlling', () => window.location.reload());
      wb.messageSkipWaiting();
    });
  });
  void wb.register().catch(() => {
    // No worker (e.g. a dev server): the island still works online.
  });
}
