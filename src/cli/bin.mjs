#!/usr/bin/env node
// Entry point for `npx lacuna`: runs the bundle built by `npm ci` (prepare script).
import { existsSync } from 'node:fs';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { dirname, resolve } from 'node:path';

const here = dirname(fileURLToPath(import.meta.url));
const bundle = resolve(here, '../../dist/cli/lacuna.js');
if (!existsSync(bundle)) {
  process.stderr.write('error: the command-line tool is not built yet. Run `npm ci` (or `npm run build`) in the project folder first.\n');
  process.exit(1);
}
const { runCli, nodeContext } = await import(pathToFileURL(bundle).href);
process.exitCode = await runCli(process.argv.slice(2), nodeContext());
