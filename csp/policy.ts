/**
 * The app's content security policy, in one place: the page's, and the engine worker's.
 *
 * The page may load only the app's own scripts, styles and workers, connect only to its own
 * origin (the service worker's fetches), and nothing else: no inline script, no `eval`, no
 * remote source, no plugin, no form, no framing. Lit's styles are constructable style sheets
 * and uPlot sets styles through the CSSOM, neither of which the policy governs; KaTeX writes
 * MathML, with no style attribute.
 *
 * The engine's worker runs the numerics. It compiles rate laws to generated code with
 * `new Function` (`src/expression/compile.ts`), about twice as fast as the closures it falls
 * back to (see README, "Content security policy"), so its own policy adds 'unsafe-eval' and
 * nothing else: a worker has no DOM, and it loads nothing but its own script. A dedicated
 * worker takes its policy from the response that serves its script, never from the page's
 * meta tag, so a host that sends no header for it leaves the worker with no policy at all.
 */

/**
 * A policy as directive name → sources. ('report-sample' allows nothing: it only asks the
 * browser to quote the start of what it blocked in its violation report.)
 */
export type Policy = Readonly<Record<string, readonly string[]>>;

/** The page's policy. Fits a meta tag: no directive a meta tag ignores. */
export const PAGE_POLICY: Policy = {
  'default-src': ["'none'"],
  'script-src': ["'self'", "'report-sample'"],
  'style-src': ["'self'", "'report-sample'"],
  'img-src': ["'self'"],
  'font-src': ["'self'"],
  'connect-src': ["'self'"],
  'worker-src': ["'self'"],
  'manifest-src': ["'self'"],
  'base-uri': ["'none'"],
  'form-action': ["'none'"],
  'object-src': ["'none'"],
};

/** What only a header can carry: the page may not be framed by anyone. */
export const HEADER_ONLY: Policy = {
  'frame-ancestors': ["'none'"],
};

/** The engine worker's policy: its own script, and generated code. */
export const WORKER_POLICY: Policy = {
  'default-src': ["'none'"],
  'script-src': ["'self'", "'unsafe-eval'"],
};

/** The built engine worker's path (Vite names it `assets/engine.worker-<hash>.js`). */
export const WORKER_PATH = /\/assets\/engine\.worker-[\w-]+\.js$/;

/** A policy as header or meta text: `default-src 'none'; script-src 'self'`. */
export function policyText(...parts: readonly Policy[]): string {
  return parts.flatMap((p) => Object.entries(p).map(([name, sources]) => `${name} ${sources.join(' ')}`)).join('; ');
}

/** The page's header: the meta tag's policy plus what only a header can carry. */
export const PAGE_HEADER = policyText(PAGE_POLICY, HEADER_ONLY);
/** The page's meta tag content. */
export const PAGE_META = policyText(PAGE_POLICY);
/** The engine worker's header. */
export const WORKER_HEADER = policyText(WORKER_POLICY);
