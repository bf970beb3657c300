/**
 * A PDF from the standalone LaTeX export: pdflatex -no-shell-escape -halt-on-error in a
 * temporary folder of its own, in its own process group, with a time limit; on timeout
 * (or when the caller goes away) the whole group is killed by its id. TeX may open
 * files for reading and writing only below that folder (openin_any/openout_any = p).
 * Nothing is cached: a GET writes nothing, the PDF follows from the stored report, and a
 * compile takes about a second; at most PDF_CONCURRENCY compiles run at once in each
 * server process, the others wait their turn.
 */
import { spawn } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { HttpError } from '../middleware/http-error.js';

/** Read at each compile: PDF_TIME_LIMIT_MS (default 30 s) and PDFLATEX (the program, default pdflatex from PATH). */
const timeLimitMs = () => Number(process.env['PDF_TIME_LIMIT_MS'] ?? 30_000);
const pdflatex = () => process.env['PDFLATEX'] ?? 'pdflatex';
const PDF_CONCURRENCY = 2;

let running = 0;
const waiting: (() => void)[] = [];

async function turn<T>(work: () => Promise<T>): Promise<T> {
  if (running >= PDF_CONCURRENCY) await new Promise<void>((resolve) => waiting.push(resolve));
  running += 1;
  try {
    return await work();
  } finally {
    running -= 1;
    waiting.shift()?.();
  }
}

const notInstalled = () =>
  new HttpError(
    503,
    'pdf_unavailable',
    'This server cannot make PDFs because pdflatex is not installed on it. Download the LaTeX file instead and compile it with pdflatex, or ask the site administrator to install TeX Live (on Debian: texlive-latex-base).',
  );

/** Runs pdflatex once over `tex`; resolves with the PDF's bytes. `signal` aborts (the group is killed). */
export function compilePdf(tex: string, signal?: AbortSignal): Promise<Buffer> {
  return turn(async () => {
    const dir = await mkdtemp(join(tmpdir(), 'sheetwise-pdf-'));
    try {
      await writeFile(join(dir, 'record.tex'), tex);
      const outcome = await new Promise<{ code: number | null; timedOut: boolean; missing: boolean }>((resolve) => {
        const child = spawn(pdflatex(), ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', 'record.tex'], {
          cwd: dir,
          detached: true, // its own process group, so the kill reaches anything it started
          stdio: 'ignore',
          env: { PATH: process.env['PATH'] ?? '/usr/bin:/bin', HOME: dir, TEXMFOUTPUT: dir, openout_any: 'p', openin_any: 'p', shell_escape: 'f' },
        });
        let timedOut = false;
        const killGroup = () => {
          try {
            if (child.pid) process.kill(-child.pid, 'SIGKILL');
          } catch {
            /* already gone */
          }
        };
        const timer = setTimeout(() => ((timedOut = true), killGroup()), timeLimitMs());
        const onAbort = () => killGroup();
        signal?.addEventListener('abort', onAbort, { once: true });
        child.on('error', (err: NodeJS.ErrnoException) => {
          clearTimeout(timer);
          signal?.removeEventListener('abort', onAbort);
          resolve({ code: null, timedOut: false, missing: err.code === 'ENOENT' });
        });
        child.on('close', (code) => {
          clearTimeout(timer);
          signal?.removeEventListener('abort', onAbort);
          resolve({ code, timedOut, missing: false });
        });
      });
      if (outcome.missing) throw notInstalled();
      if (outcome.timedOut) throw new HttpError(504, 'pdf_timeout', `Making the PDF took longer than ${Math.max(1, Math.round(timeLimitMs() / 1000))} s and was stopped. Download the LaTeX file instead.`);
      if (signal?.aborted) throw new HttpError(499, 'cancelled', 'The request was cancelled.');
      if (outcome.code !== 0) {
        const log = await readFile(join(dir, 'record.log'), 'latin1').catch(() => '');
        const first = log.split('\n').find((l) => l.startsWith('! '));
        throw new HttpError(500, 'pdf_failed', `pdflatex could not make the PDF${first ? ` (${first.slice(2, 160)})` : ''}. Download the LaTeX file instead.`);
      }
      return await readFile(join(dir, 'record.pdf'));
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
}
