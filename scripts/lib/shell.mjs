// Small helpers shared by the start, test and bench scripts.
import { spawnSync } from 'node:child_process';
import { existsSync, statSync } from 'node:fs';
import { join } from 'node:path';

export function log(message) {
  process.stdout.write(`[sheetwise] ${message}\n`);
}

/** Runs a command to completion; throws with its output when it fails. */
export function run(cmd, args, { quiet = false, env, cwd } = {}) {
  const result = spawnSync(cmd, args, { stdio: quiet ? 'pipe' : 'inherit', env, cwd, encoding: 'utf8' });
  if (result.error) throw result.error;
  if (result.status !== 0) {
    const output = quiet ? `\n${result.stdout ?? ''}${result.stderr ?? ''}` : '';
    throw new Error(`${cmd} ${args.join(' ')} exited with ${result.status}${output}`);
  }
  return result;
}

/** Installs dependencies when node_modules is missing or older than the lockfile. */
export function ensureDependencies(projectDir) {
  const marker = join(projectDir, 'node_modules', '.package-lock.json');
  const lock = join(projectDir, 'package-lock.json');
  const stale = !existsSync(marker) || statSync(marker).mtimeMs < statSync(lock).mtimeMs;
  if (!stale) return;
  log('Installing dependencies (npm ci)…');
  run('npm', ['ci', '--no-audit', '--no-fund'], { cwd: projectDir });
}

/** Installs Debian's Chromium for the browser tests when it is missing (root only). */
export function ensureChromium() {
  if (existsSync('/usr/bin/chromium')) return '/usr/bin/chromium';
  if (process.getuid?.() !== 0) {
    throw new Error('Chromium is not installed. Run: sudo apt-get update && sudo apt-get install -y chromium');
  }
  log('Installing Chromium from Debian packages (apt-get install chromium)…');
  run('apt-get', ['update'], { quiet: true });
  run('apt-get', ['install', '-y', '--no-install-recommends', 'chromium', 'fonts-dejavu-core'], {
    quiet: true,
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  return '/usr/bin/chromium';
}

/**
 * A python3 that has mpmath (the tests' independent quadrature). Tries the PATH's
 * python3, then Debian's; installs python3-mpmath from Debian when neither has it.
 */
export function ensurePythonMpmath() {
  const has = (py) => spawnSync(py, ['-c', 'import mpmath'], { stdio: 'ignore' }).status === 0;
  for (const py of ['python3', '/usr/bin/python3']) if (has(py)) return py;
  if (process.getuid?.() !== 0) {
    throw new Error('mpmath for Python 3 is missing. Run: sudo apt-get install -y python3-mpmath');
  }
  log('Installing python3-mpmath from Debian packages…');
  run('apt-get', ['update'], { quiet: true });
  run('apt-get', ['install', '-y', '--no-install-recommends', 'python3-mpmath'], {
    quiet: true,
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
  if (has('/usr/bin/python3')) return '/usr/bin/python3';
  throw new Error('python3-mpmath was installed but /usr/bin/python3 cannot import mpmath.');
}

/** pdflatex and pdftotext from Debian (texlive-latex-base, poppler-utils) for the export tests; installed when missing (root only). */
export function ensureTex() {
  const has = (cmd) => spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
  if (has('pdflatex') && has('pdftotext')) return;
  if (process.getuid?.() !== 0) {
    throw new Error('pdflatex or pdftotext is missing. Run: sudo apt-get install -y texlive-latex-base poppler-utils');
  }
  log('Installing TeX from Debian packages (texlive-latex-base, poppler-utils)…');
  run('apt-get', ['update'], { quiet: true });
  run('apt-get', ['install', '-y', '--no-install-recommends', 'texlive-latex-base', 'poppler-utils'], {
    quiet: true,
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
}
