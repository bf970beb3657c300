// Gzip sizes of the client: what the sign-in page loads first, and the editor chunk.
import { readFileSync, readdirSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { gzipSync } from 'node:zlib';

const dir = process.argv[2] ?? 'dist/sheetwise/browser';
if (!existsSync(join(dir, 'index.html'))) {
  console.error(`No client build in ${dir}: run \`npx ng build\` first.`);
  process.exit(2);
}
const html = readFileSync(join(dir, 'index.html'), 'utf8');
// The initial load: every script, module preload and stylesheet index.html names.
const initial = [...html.matchAll(/(?:src|href)="([^"]+\.(?:js|css))"/g)].map((m) => m[1]);
const gz = (file) => gzipSync(readFileSync(join(dir, file))).length;
const initialGzip = initial.reduce((s, f) => s + gz(f), 0);
// The editor chunk: the lazy script that carries the editor core.
const chunks = readdirSync(dir).filter((f) => f.endsWith('.js') && !initial.includes(f));
const editor = chunks
  .map((f) => ({ f, text: readFileSync(join(dir, f), 'utf8') }))
  .filter(({ text }) => /monaco|editor\.main|IStandaloneCodeEditor|MonacoEnvironment/.test(text))
  .map(({ f }) => ({ file: f, gzip: gz(f) }))
  .sort((a, b) => b.gzip - a.gzip)[0] ?? null;
const kB = (n) => `${(n / 1024).toFixed(1)} kB`;
console.log(`initial load (${initial.length} files): ${kB(initialGzip)} gzip`);
console.log(editor ? `editor chunk ${editor.file}: ${kB(editor.gzip)} gzip` : 'editor chunk: none found (the editor is not in this build)');
console.log(`BENCH_JSON ${JSON.stringify({ client: { initialGzipBytes: initialGzip, initialFiles: initial, editorChunk: editor } })}`);
