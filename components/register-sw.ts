/**
 * Registers the offline service worker (`sw.js`, written by the build; see
 * `offline/vite-plugin.ts`) in production builds only: in development and in the tests there
 * is no `sw.js`, and a worker caching the dev server's modules would only get in the way.
 */

/**
 * Registers the worker once the page has loaded (so that its download of the app's files does
 * not compete with the first view). Resolves with the registration, or undefined in a
 * development build, in a browser without service workers, or when registering failed (a
 * warning is logged: the app still works, online only). Never rejects.
 */
export async function registerServiceWorker(): Promise<ServiceWorkerRegistration | undefined> {
  if (!import.meta.env.PROD || !('serviceWorker' in navigator)) return undefined;
  if (document.readyState !== 'complete') await new Promise((resolve) => addEventListener('load', resolve, { once: true }));
  const base = import.meta.env.BASE_URL;
  try {
    return await navigator.serviceWorker.register(`${base}sw.js`, { scope: base });
  } catch (err) {
    console.warn('Ratebook could not install its offline copy; it works online only.', err);
    return undefined;
  }
}
