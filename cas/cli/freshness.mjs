// Whether dist/cli/ (built by scripts/build-cli.mjs) is at least as new as every source
// file it is built from: cas/ and shared/ (about 90 files: a stat each, ~1 ms).
import { readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';

const OUTPUTS = ['dist/cli/main.mjs', 'dist/cli/worker.cjs', 'dist/cli/core.cjs'];
const SOURCES = ['cas', 'shared'];

function newestBelow(dir) {
  let newest = 0;
  let file = '';
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    if (entry.isDirectory()) {
      const below = newestBelow(p);
      if (below.newest > newest) ({ newest, file } = below);
    } else if (/\.(ts|js|mjs)$/.test(entry.name)) {
      const t = statSync(p).mtimeMs;
      if (t > newest) { newest = t; file = p; }
    }
  }
  return { newest, file };
}

/** { ok: true } or { ok: false, why: 'missing' | 'older than cas/…' }. */
export function buildIsCurrent(root) {
  let built = Infinity;
  for (const out of OUTPUTS) {
    try { built = Math.min(built, statSync(join(root, out)).mtimeMs); } catch { return { ok: false, why: 'missing' }; }
  }
  for (const dir of SOURCES) {
    const { newest, file } = newestBelow(join(root, dir));
    if (newest > built) return { ok: false, why: `older than ${file.slice(root.length + 1)}` };
  }
  return { ok: true };
}
