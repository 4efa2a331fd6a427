/** Registers the app shell's service worker (built files only), so a reload offline still opens the pad. */
export function registerServiceWorker(): void {
  if (!import.meta.env.PROD || !('serviceWorker' in navigator)) return;
  // The first page load happens before the worker controls it: once it does, ask who is signed
  // in through it, so it can remember the answer for an offline reload.
  navigator.serviceWorker.addEventListener('controllerchange', () => {
    void fetch('/api/auth/me', {
      credentials: 'same-origin',
      headers: { accept: 'application/json' },
    }).catch(() => undefined);
  });
  navigator.serviceWorker.register('/sw.js', { scope: '/' }).catch((err: unknown) => {
    // Without it the app works online; only an offline reload is lost.
    console.warn('service worker not registered', err);
  });
}
