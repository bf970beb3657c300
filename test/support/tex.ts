// Compiling a LaTeX file as a person receiving an export would: pdflatex without shell
// escape, in a folder of its own, recording every file it opens (-recorder). The TeX
// programs come from Debian (texlive-latex-base, poppler-utils for pdftotext); when they
// are missing and the tests run as root they are installed like Chromium and mpmath are.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const has = (cmd: string) => spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;

export function ensureTex(): void {
  if (has('pdflatex') && has('pdftotext')) return;
  if (process.getuid?.() !== 0) {
    throw new Error('pdflatex or pdftotext is missing. Run: sudo apt-get install -y texlive-latex-base poppler-utils');
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update'], { stdio: 'ignore', env });
  const r = spawnSync('apt-get', ['install', '-y', '--no-install-recommends', 'texlive-latex-base', 'poppler-utils'], { encoding: 'utf8', env });
  if (r.status !== 0 || !has('pdflatex') || !has('pdftotext')) throw new Error(`Installing TeX failed:\n${r.stdout}${r.stderr}`);
}

/** Runs a command in its own process group; killed (by its group id) after `ms`. */
function runBounded(cmd: string, args: string[], cwd: string, ms: number): Promise<{ code: number | null; output: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd, detached: true, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d) => (output += d));
    child.stderr.on('data', (d) => (output += d));
    const timer = setTimeout(() => {
      try {
        process.kill(-child.pid!, 'SIGKILL');
      } catch {
        /* already gone */
      }
    }, ms);
    child.on('error', reject);
    child.on('close', (code) => {
      clearTimeout(timer);
      resolve({ code, output });
    });
  });
}

export interface Compiled {
  dir: string;
  /** pdflatex's exit code (0: a PDF without errors). */
  code: number | null;
  log: string;
  /** Files pdflatex read and wrote, from its -recorder list. */
  inputs: string[];
  outputs: string[];
  /** The files in the folder afterwards. */
  files: string[];
  /** The PDF's text by pdftotext ('' when there is no PDF). */
  text: string;
}

/** `layout`: pdftotext keeps the page's horizontal spacing (-layout). */
export async function compileLatex(tex: string, jobName = 'appendix', layout = false): Promise<Compiled> {
  const dir = mkdtempSync(join(tmpdir(), 'sheetwise-tex-'));
  writeFileSync(join(dir, `${jobName}.tex`), tex);
  const run = await runBounded('pdflatex', ['-no-shell-escape', '-interaction=nonstopmode', '-halt-on-error', '-recorder', `${jobName}.tex`], dir, 120_000);
  const fls = existsSync(join(dir, `${jobName}.fls`)) ? readFileSync(join(dir, `${jobName}.fls`), 'utf8') : '';
  const pick = (kind: string) => fls.split('\n').filter((l) => l.startsWith(`${kind} `)).map((l) => l.slice(kind.length + 1));
  let text = '';
  if (existsSync(join(dir, `${jobName}.pdf`))) {
    const t = await runBounded('pdftotext', ['-enc', 'UTF-8', ...(layout ? ['-layout'] : []), `${jobName}.pdf`, '-'], dir, 60_000);
    text = t.output.normalize('NFC');
  }
  const logFile = join(dir, `${jobName}.log`);
  return {
    dir,
    code: run.code,
    log: existsSync(logFile) ? readFileSync(logFile, 'latin1') : run.output,
    inputs: pick('INPUT'),
    outputs: pick('OUTPUT'),
    files: readdirSync(dir).sort(),
    text,
  };
}
