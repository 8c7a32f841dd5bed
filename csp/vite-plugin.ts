/**
 * The content security policy in the build and under `vite preview` (see `csp/policy.ts`):
 *
 * - build: writes the page's policy into `index.html` as a meta tag, right after the charset
 *   (before any script or style);
 * - preview: the page's header comes from `preview.headers` (vite.config.ts); this plugin
 *   gives the engine worker's script its own header instead;
 * - with `RATEBOOK_CSP_REPORTS=<file>` in the environment (the end-to-end tests), every
 *   policy sent as a header also asks the browser to report violations to
 *   `/__csp-report`, and each report is appended to that file as one JSON line.
 *
 * The development server sends no policy (its error overlay and module reloading need
 * inline styles and scripts of their own).
 */
import { appendFileSync } from 'node:fs';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { Plugin } from 'vite';
import { PAGE_META, WORKER_HEADER, WORKER_PATH } from './policy.ts';

/** Where the browser sends violation reports when `RATEBOOK_CSP_REPORTS` is set. */
export const REPORT_PATH = '/__csp-report';

const CSP = 'content-security-policy';

export function contentSecurityPolicy(): Plugin {
  return {
    name: 'ratebook:content-security-policy',
    transformIndexHtml: {
      order: 'post',
      handler(html, ctx) {
        if (ctx.server) return html;
        const charset = /<meta charset="utf-8" \/>\n?/i;
        if (!charset.test(html)) throw new Error('index.html: the <meta charset="utf-8" /> line the policy follows is missing');
        return html.replace(charset, (line) => `${line}    <meta http-equiv="Content-Security-Policy" content="${PAGE_META}" />\n`);
      },
    },
    configurePreviewServer(server) {
      const reports = process.env.RATEBOOK_CSP_REPORTS;
      server.middlewares.use((req: IncomingMessage, res: ServerResponse, next: () => void) => {
        const path = (req.url ?? '/').split('?')[0];
        if (reports && path === REPORT_PATH) {
          let body = '';
          req.setEncoding('utf8');
          req.on('data', (chunk: string) => { body += chunk; });
          req.on('end', () => {
            appendFileSync(reports, `${body.replace(/\s*\n\s*/g, ' ')}\n`);
            res.statusCode = 204;
            res.end();
          });
          return;
        }
        const worker = WORKER_PATH.test(path);
        const set = res.setHeader.bind(res);
        res.setHeader = (name: string, value: number | string | readonly string[]) => {
          if (name.toLowerCase() !== CSP) return set(name, value);
          const policy = worker ? WORKER_HEADER : String(value);
          return set(name, reports ? `${policy}; report-uri ${REPORT_PATH}` : policy);
        };
        if (worker) res.setHeader(CSP, WORKER_HEADER);
        next();
      });
    },
  };
}
