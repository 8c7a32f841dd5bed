import { defineConfig } from 'vite';
import { offlineServiceWorker } from './offline/vite-plugin.ts';
import { contentSecurityPolicy } from './csp/vite-plugin.ts';
import { PAGE_HEADER } from './csp/policy.ts';

// Dependencies are pre-bundled up front. If Vite discovered one of these only
// when a browser test imported it, it would re-optimize and reload the page in
// the middle of the test run. Add every package the app or tests import here.
const prebundled = [
  'mathjs', 'lit', 'idb-keyval', 'fast-check', 'chai',
  'uplot', 'papaparse',
  'lit/directives/ref.js', 'lit/directives/unsafe-html.js', 'katex',
  '@codemirror/state', '@codemirror/view', '@codemirror/commands', '@codemirror/autocomplete',
];

export default defineConfig({
  root: '.',
  optimizeDeps: {
    include: prebundled,
    // Served as it is: it reaches the test runner through a file the runner serves beside it.
    exclude: ['@web/test-runner-commands'],
    // Let the dependency scanner also crawl the browser tests, so a package
    // missing from the list above is still found before the first request.
    entries: ['index.html', 'test/browser/**/*.test.ts'],
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    // The engine's modules (src/) do nothing when loaded but define things: a bundle takes
    // only those whose exports it uses. Without this, importing src/index.ts from the app's
    // first script would pull the whole engine (mathjs among it) into that script, though only
    // the study view, a chunk of its own, uses most of it.
    rolldownOptions: { treeshake: { moduleSideEffects: (id: string) => !/[\\/]src[\\/].*\.ts$/.test(id) } },
  },
  // The page's content security policy as a header (csp/policy.ts); the plugin gives the
  // engine worker its own and writes the page's into the built index.html as a meta tag.
  preview: { headers: { 'Content-Security-Policy': PAGE_HEADER } },
  // Production builds only: writes dist/sw.js, which caches every built file for offline use.
  plugins: [offlineServiceWorker(), contentSecurityPolicy()],
});
