#!/usr/bin/env node
// `npm run sheetwise`: runs the built command line (dist/cli/, made by `npm run build` or
// `node scripts/build-cli.mjs`) when it is at least as new as cas/ and shared/; otherwise
// it says so on stderr and runs cas/cli/main.ts from source through tsx, in this same
// process (so signals reach it directly), about a second slower to start.
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { buildIsCurrent } from './freshness.mjs';

const root = join(dirname(fileURLToPath(import.meta.url)), '..', '..');
const current = buildIsCurrent(root);
if (current.ok) {
  await import(pathToFileURL(join(root, 'dist/cli/main.mjs')).href);
} else {
  process.stderr.write(`sheetwise: the built command line (dist/cli/) is ${current.why}; running from source with tsx, which is slower to start. Run \`npm run build\` (or \`node scripts/build-cli.mjs\`) to build it.\n`);
  const { register } = await import('tsx/esm/api');
  register();
  await import(pathToFileURL(join(root, 'cas/cli/main.ts')).href);
}
