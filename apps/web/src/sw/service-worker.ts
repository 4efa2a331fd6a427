/**
 * The app shell's service worker: lets the recorder pad load when the tablet reloads with no
 * network. It keeps the built files (every route chunk, precached at install) and the last
 * answer to GET /api/auth/me; everything else under /api and the live socket go to the network
 * untouched. Taps never pass through here: they live in the IndexedDB outbox.
 *
 * Built as its own entry (sw.js at the site root); the build prepends the precache list.
 */

interface ExtendableEventLike extends Event {
  waitUntil(promise: Promise<unknown>): void;
}
interface FetchEventLike extends ExtendableEventLike {
  request: Request;
  respondWith(response: Promise<Response> | Response): void;
}
interface WorkerScope {
  addEventListener(
    type: 'install' | 'activate',
    listener: (event: ExtendableEventLike) => void,
  ): void;
  addEventListener(type: 'fetch', listener: (event: FetchEventLike) => void): void;
  skipWaiting(): Promise<void>;
  clients: { claim(): Promise<void> };
  location: Location;
  __STEADYHAND_PRECACHE__?: string[];
}

const scope = self as unknown as WorkerScope;
const PRECACHE = scope.__STEADYHAND_PRECACHE__ ?? ['/'];
// A new build brings a new list, hence a new cache; old ones are dropped on activation.
const SHELL_CACHE = `steadyhand-shell-${hashOf(PRECACHE.join('|'))}`;
const ME_CACHE = 'steadyhand-me';
const ME_PATH = '/api/auth/me';

function hashOf(text: string): string {
  let h = 5381;
  for (let i = 0; i < text.length; i++) h = ((h << 5) + h + text.charCodeAt(i)) | 0;
  return (h >>> 0).toString(36);
}

scope.addEventListener('install', (event) => {
  event.waitUntil(
    caches
      .open(SHELL_CACHE)
      .then((cache) => cache.addAll(PRECACHE))
      .then(() => scope.skipWaiting()),
  );
});

scope.addEventListener('activate', (event) => {
  event.waitUntil(
    caches
      .keys()
      .then((keys) =>
        Promise.all(
          keys
            .filter((k) => k.startsWith('steadyhand-shell-') && k !== SHELL_CACHE)
            .map((k) => caches.delete(k)),
        ),
      )
      .then(() => scope.clients.claim()),
  );
});

scope.addEventListener('fetch', (event) => {
  const request = event.request;
  const url = new URL(request.url);
  if (url.origin !== scope.location.origin || url.pathname.startsWith('/socket.io')) return;

  if (url.pathname === '/api/auth/login' || url.pathname === '/api/auth/logout') {
    // A new or ended session: the remembered user no longer holds.
    event.respondWith(
      fetch(request).then(async (response) => {
        if (response.ok) {
          await caches.delete(ME_CACHE);
          // After signing in, remember who, for a reload without network.
          if (url.pathname === '/api/auth/login')
            await rememberedMe(new Request(ME_PATH, { credentials: 'same-origin' })).catch(
              () => undefined,
            );
        }
        return response;
      }),
    );
    return;
  }
  if (request.method !== 'GET') return;

  if (url.pathname === ME_PATH) {
    event.respondWith(rememberedMe(request));
    return;
  }
  if (url.pathname.startsWith('/api/')) return;

  if (request.mode === 'navigate') {
    event.respondWith(
      fetch(request).catch(
        async () => (await caches.match('/', { cacheName: SHELL_CACHE })) ?? Response.error(),
      ),
    );
    return;
  }
  event.respondWith(
    caches.match(request).then(
      (hit) =>
        hit ??
        fetch(request).then(async (response) => {
          if (response.ok && url.pathname.startsWith('/assets/')) {
            const cache = await caches.open(SHELL_CACHE);
            await cache.put(request, response.clone());
          }
          return response;
        }),
    ),
  );
});

/** Network first; with no network at all, the last signed-in answer, so the pad still opens. */
async function rememberedMe(request: Request): Promise<Response> {
  try {
    const response = await fetch(request);
    const cache = await caches.open(ME_CACHE);
    if (response.ok) await cache.put(ME_PATH, response.clone());
    else if (response.status === 401) await cache.delete(ME_PATH);
    return response;
  } catch (err) {
    const remembered = await caches.match(ME_PATH, { cacheName: ME_CACHE });
    if (remembered) return remembered;
    throw err;
  }
}
