/**
 * sheetwise eval FILE [--json] | sheetwise check DIR
 * Exit 0: all statements evaluated and every expect held; 1: an expect failed or
 * a statement had an error; 2: usage error or unreadable file.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { evaluateWorksheet } from '../index.js';
import { formatReport } from './format.js';

const USAGE = 'Usage: sheetwise eval FILE [--json]\n       sheetwise check DIR [--json]';

function usage(message?: string): never {
  if (message) process.stderr.write(`${message}\n`);
  process.stderr.write(`${USAGE}\n`);
  process.exit(2);
}

function read(file: string): string {
  try { return readFileSync(file, 'utf8'); } catch (e) {
    process.stderr.write(`Cannot read ${file}: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exit(2);
  }
}

function worksheetsBelow(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const entry of readdirSync(d, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(d, entry.name);
      if (entry.isDirectory()) { if (entry.name !== 'node_modules' && !entry.name.startsWith('.')) walk(p); }
      else if (entry.name.endsWith('.swk')) out.push(p);
    }
  };
  walk(dir);
  return out;
}

function main(argv: string[]): number {
  const json = argv.includes('--json');
  const args = argv.filter((a) => a !== '--json');
  const unknown = args.find((a) => a.startsWith('-'));
  if (unknown) usage(`Unknown option ${unknown}.`);
  const [command, target, ...extra] = args;
  if (!command || !target || extra.length > 0) usage();
  if (command === 'eval') {
    const report = evaluateWorksheet(read(target), { file: target });
    process.stdout.write(json ? `${JSON.stringify(report)}\n` : `${formatReport(report)}\n`);
    return report.ok ? 0 : 1;
  }
  if (command === 'check') {
    let isDir = false;
    try { isDir = statSync(target).isDirectory(); } catch { /* reported below */ }
    if (!isDir) { process.stderr.write(`Cannot read the folder ${target}.\n`); return 2; }
    const files = worksheetsBelow(target);
    const reports = files.map((f) => evaluateWorksheet(read(f), { file: f }));
    const ok = reports.every((r) => r.ok);
    if (json) process.stdout.write(`${JSON.stringify({ ok, files: reports })}\n`);
    else {
      for (const r of reports) process.stdout.write(`${r.ok ? 'ok     ' : 'NOT ok '} ${r.file}\n`);
      process.stdout.write(`${reports.filter((r) => r.ok).length} of ${reports.length} worksheets ok\n`);
    }
    return ok ? 0 : 1;
  }
  usage(`Unknown command ${command}.`);
}

process.exitCode = main(process.argv.slice(2));
