/**
 * Keep the screen awake while a canal is open (Screen Wake Lock API where available).
 * The browser drops the lock whenever the page is hidden, so it is asked for again when the
 * page becomes visible. Returns a function that releases it.
 */
export function keepAwake(): () => void {
  const nav = navigator as Navigator & { wakeLock?: { request(type: 'screen'): Promise<WakeLockSentinel> } };
  if (!nav.wakeLock) return () => {};
  let sentinel: WakeLockSentinel | null = null;
  let active = true;
  const request = async () => {
    if (!active || document.visibilityState !== 'visible') return;
    try {
      sentinel = await nav.wakeLock!.request('screen');
    } catch {
      // Refused (battery saver, not a secure context): the canal works without it.
      sentinel = null;
    }
  };
  const onVisible = () => {
    if (document.visibilityState === 'visible' && (!sentinel || sentinel.released)) void request();
  };
  document.addEventListener('visibilitychange', onVisible);
  void request();
  return () => {
    active = false;
    document.removeEventListener('visibilitychange', onVisible);
    void sentinel?.release().catch(() => {});
    sentinel = null;
  };
}
