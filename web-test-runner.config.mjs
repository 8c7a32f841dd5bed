import { createServer } from 'node:net';
import { defaultReporter, summaryReporter } from '@web/test-runner';
import { playwrightLauncher } from '@web/test-runner-playwright';
import { vitePlugin, removeViteLogging } from '@remcovaes/web-test-runner-vite-plugin';
import { DEFAULT_CHROMIUM, findChromium } from './scripts/find-chromium.mjs';
import { countReporter } from './scripts/wtr-count-reporter.mjs';

// The Vite plugin proxies to the port Vite was *configured* with, so if that
// port were busy (say, `npm start` is running) Vite would move on and the
// proxy would talk to the wrong server. Pick a free port and insist on it.
function freePort() {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.unref();
    server.on('error', reject);
    server.listen(0, () => {
      const { port } = server.address();
      server.close(() => resolve(port));
    });
  });
}

function isLitDevModeNotice({ args }) {
  return args.some((arg) => typeof arg === 'string' && arg.startsWith('Lit is in dev mode.'));
}

const executablePath = findChromium() ?? process.env.CHROME_PATH ?? DEFAULT_CHROMIUM;

/** @type {import('@web/test-runner').TestRunnerConfig} */
export default {
  files: ['test/browser/**/*.test.ts'],
  concurrency: 1,
  browsers: [
    playwrightLauncher({
      product: 'chromium',
      launchOptions: {
        executablePath,
        headless: true,
        args: [
          '--no-sandbox',
          '--disable-gpu',
          '--disable-background-networking',
          '--disable-component-update',
          '--disable-sync',
        ],
      },
    }),
  ],
  plugins: [vitePlugin({ server: { port: await freePort(), strictPort: true } })],
  filterBrowserLogs: (log) => removeViteLogging(log) && !isLitDevModeNotice(log),
  reporters: [
    defaultReporter(),
    // The default reporter already prints errors and logs; this adds the per-test list.
    summaryReporter({ reportTestErrors: false, reportTestLogs: false }),
    countReporter(),
  ],
  testFramework: {
    config: { ui: 'bdd', timeout: 10000 },
  },
  browserStartTimeout: 60000,
  testsStartTimeout: 60000,
  testsFinishTimeout: 120000,
};
