/**
 * Regenerates the example outputs in README.md and docs/worksheet-language.md from their
 * worksheets, so the documentation shows real runs of the current core:
 *   node_modules/.bin/tsx scripts/render-examples.ts          # rewrite the files
 *   node_modules/.bin/tsx scripts/render-examples.ts --check  # exit 1 when an output is stale
 * An example is a fenced worksheet block, then a line
 * "`npm run -s sheetwise -- eval NAME.swk` (exit code N):", then a fenced output block;
 * "`npm run -s sheetwise -- eval NAME.swk --json` prints …:" is followed by pretty-printed JSON.
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { evaluateWorksheet } from '../cas/index.js';
import { formatReport } from '../cas/cli/format.js';

const FILES = ['README.md', 'docs/worksheet-language.md'];
const FENCE = '```';

/** Replace the fenced block that starts at or after line `from` with `body`; returns the index after it. */
function replaceBlock(lines: string[], from: number, body: string[]): number {
  const open = lines.findIndex((l, k) => k >= from && l.startsWith(FENCE));
  const close = lines.findIndex((l, k) => k > open && l.startsWith(FENCE));
  lines.splice(open + 1, close - open - 1, ...body);
  return open + body.length + 2;
}

/** The examples of a document: each eval line with its file, whether it prints JSON, and the worksheet it runs. */
function* examples(lines: readonly string[]): Generator<{ index: number; file: string; json: boolean; source: string }> {
  const sources = new Map<string, string>();
  let last: string[] = [];
  for (let k = 0; k < lines.length; k++) {
    const line = lines[k]!;
    if (line.startsWith(FENCE)) {
      const close = lines.findIndex((l, j) => j > k && l.startsWith(FENCE));
      last = lines.slice(k + 1, close);
      k = close;
      continue;
    }
    const m = /^`npm run -s sheetwise -- eval ([\w.-]+\.swk)( --json)?`/.exec(line);
    if (!m) continue;
    const file = m[1]!; const json = !!m[2];
    const source = json ? sources.get(file) : last.join('\n');
    if (source === undefined) throw new Error(`no worksheet for ${file}`);
    sources.set(file, source);
    yield { index: k, file, json, source };
  }
}

/** The worksheets of a document's examples, by file name. */
export function exampleSources(text: string): Map<string, string> {
  const out = new Map<string, string>();
  for (const e of examples(text.split('\n'))) if (!out.has(e.file)) out.set(e.file, e.source);
  return out;
}

export function render(text: string): string {
  const lines = text.split('\n');
  // replace from the end, so earlier indices stay valid
  for (const { index, file, json, source } of [...examples(lines)].reverse()) {
    const report = evaluateWorksheet(`${source}\n`, { file });
    // timings vary from run to run; they are not part of what the documentation shows
    const stable = JSON.parse(JSON.stringify(report, (key, v) => (key === 'timeMs' ? 0 : v)));
    if (json) replaceBlock(lines, index + 1, JSON.stringify(stable, null, 2).split('\n'));
    else {
      lines[index] = `\`npm run -s sheetwise -- eval ${file}\` (exit code ${report.ok ? 0 : 1}):`;
      replaceBlock(lines, index + 1, formatReport(stable).replace(/, \d+ ms\./g, '.').split('\n'));
    }
  }
  return lines.join('\n');
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop()!)) {
  const check = process.argv.includes('--check');
  let stale = false;
  for (const f of FILES) {
    const before = readFileSync(f, 'utf8');
    const after = render(before);
    if (after === before) continue;
    if (check) { console.error(`${f}: example outputs are stale; run node_modules/.bin/tsx scripts/render-examples.ts`); stale = true; }
    else { writeFileSync(f, after); console.log(`${f}: example outputs regenerated`); }
  }
  process.exit(stale ? 1 : 0);
}
