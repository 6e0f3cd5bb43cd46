/**
 * Register the service worker (built by @vite-pwa/astro with registerType "prompt") and
 * tell the island when a new version is waiting; `accept()` activates it and reloads.
 * The browser's own API, not workbox-window: the island's JavaScript budget (≤ 100 KB
 * gzipped) has no room for its 2 KB, and this is all of it the island used.
 */
export function registerServiceWorker(onUpdate: (accept: () => void) => void): void {
  if (!('serviceWorker' in navigator) || !window.isSecureContext) return;
  const sw = navigator.serviceWorker;
  const offer = (waiting: ServiceWorker) =>
    onUpdate(() => {
      sw.addEventListener('controllerchange', () => window.location.reload());
      // The generated worker skips waiting on this message (vite-plugin-pwa, prompt mode).
      waiting.postMessage({ type: 'SKIP_WAITING' });
    });
  sw.register('/sw.js', { scope: '/' })
    .then((reg) => {
      // Without a controller an installed worker is the first one, not an update.
      if (reg.waiting && sw.controller) offer(reg.waiting);
      reg.addEventListener('updatefound', () => {
        const next = reg.installing;
        next?.addEventListener('statechange', () => {
          if (next.state === 'installed' && sw.controller) offer(next);
        });
      });
    })
    .catch(() => {
      // No worker (e.g. a dev server): the island still works online.
    });
}
