// @ts-check
/// <reference lib="webworker" />
/**
 * Ratebook's service worker: it keeps the built app in a cache so the app opens without a
 * network after the first visit.
 *
 * This file is a template. The build (`offline/vite-plugin.ts`) replaces the `BUILD` line
 * below with the build's version and the list of every file it wrote, and saves the result as
 * `sw.js` at the root of the output. It is never loaded in development.
 *
 * - install: fetches every built file (bypassing the HTTP cache) into a cache named after the
 *   version, then takes over at once (the files are hashed, so an open page keeps working).
 * - activate: deletes the caches of other versions and controls the open pages.
 * - built files: cache first (the network only if a file is somehow missing).
 * - pages (navigations): the network first, so an online visit gets the newest build; the
 *   cached `index.html` when the network fails, answers 5xx, or takes longer than
 *   NETWORK_TIMEOUT_MS. The cached page is never replaced by a network copy: it must match
 *   the cached files, which only a new worker version replaces.
 */

/** @type {{ version: string, files: string[] }} */
const BUILD = { version: 'template', files: [] }; // ratebook:build (replaced at build time)

const CACHE_PREFIX = 'ratebook-app-';
const CACHE = CACHE_PREFIX + BUILD.version;
const SHELL = 'index.html';
/** How long a page request may wait for the network before the cached page is used. */
const NETWORK_TIMEOUT_MS = 4000;

const sw = /** @type {ServiceWorkerGlobalScope} */ (/** @type {unknown} */ (self));
/** @param {string} file a path relative to the worker's scope */
const urlOf = (file) => new URL(file, sw.registration.scope).href;
/** @param {string} href */
const withoutQuery = (href) => { const u = new URL(href); return u.origin + u.pathname; };
const built = new Set(BUILD.files.map(urlOf));

sw.addEventListener('install', (event) => {
  event.waitUntil((async () => {
    const cache = await caches.open(CACHE);
    await cache.addAll(BUILD.files.map((file) => new Request(urlOf(file), { cache: 'reload' })));
    await sw.skipWaiting();
  })());
});

sw.addEventListener('activate', (event) => {
  event.waitUntil((async () => {
    for (const key of await caches.keys()) {
      if (key.startsWith(CACHE_PREFIX) && key !== CACHE) await caches.delete(key);
    }
    await sw.clients.claim();
  })());
});

sw.addEventListener('fetch', (event) => {
  const request = event.request;
  if (request.method !== 'GET' || new URL(request.url).origin !== sw.location.origin) return;
  if (request.mode === 'navigate') event.respondWith(page(request));
  else if (built.has(withoutQuery(request.url))) event.respondWith(builtFile(request));
});

/** @param {Request} request */
async function builtFile(request) {
  const cache = await caches.open(CACHE);
  // ignoreVary: servers add `Vary: Origin`, and a module script's request differs in Origin
  // from the one that filled the cache; a built file is the same file whoever asks
  const hit = await cache.match(request, { ignoreSearch: true, ignoreVary: true });
  if (hit) return hit;
  const response = await fetch(request);
  if (response.ok) await cache.put(withoutQuery(request.url), response.clone());
  return response;
}

/** @param {Request} request */
async function page(request) {
  const cached = await (await caches.open(CACHE)).match(urlOf(SHELL), { ignoreVary: true });
  const network = fetch(request);
  if (!cached) return network;
  network.catch(() => {}); // its failure is handled below; never an unhandled rejection
  /** @type {Promise<'slow'>} */
  const slow = new Promise((resolve) => setTimeout(resolve, NETWORK_TIMEOUT_MS, 'slow'));
  try {
    const response = await Promise.race([network, slow]);
    // a redirect or a 404 is the server's answer; only a failing server falls back
    return response === 'slow' || response.status >= 500 ? cached : response;
  } catch {
    return cached; // offline
  }
}
