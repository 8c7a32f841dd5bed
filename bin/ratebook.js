#!/usr/bin/env node
// The `ratebook` command. The engine is TypeScript; tsx compiles it on the fly, so the
// command works straight after `npm install`, with no build step to remember.
import { register } from 'tsx/esm/api';

register();
const { main } = await import('../src/cli/cli.ts');
process.exitCode = main(process.argv.slice(2));
