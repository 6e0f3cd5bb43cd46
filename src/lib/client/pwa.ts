import { Workbox } from 'workbox-window';

/**
 * Register the service worker (built by @vite-pwa/astro with registerType "prompt") and
 * tell the island when a new version is waiting; `accept()` activates it and reloads.
 */
export function registerServiceWorker(onUpdate: (accept: () => void) => void): void {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return;
  const wb = new Workbox('/sw.js', { scope: '/' });
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
