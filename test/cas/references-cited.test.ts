/**
 * Every source a test names has an entry in docs/references.md: the test files are
 * searched for a fixed list of source keywords (authors, handbooks, reference
 * libraries), and each keyword found must be matched by its entry's text in
 * docs/references.md. Checks "worked out by hand" need no entry.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync, readdirSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = fileURLToPath(new URL('../../', import.meta.url));
const TEST_DIR = join(ROOT, 'test');
const REFERENCES = join(ROOT, 'docs', 'references.md');
const SELF = fileURLToPath(import.meta.url);

/** A keyword as a test writes it, and the text its entry must contain in docs/references.md. */
const SOURCES: { cited: RegExp; entry: string }[] = [
  { cited: /Gradshteyn|\bG&R\b/, entry: 'Gradshteyn & Ryzhik' },
  { cited: /\bRyzhik\b/, entry: 'Gradshteyn & Ryzhik' },
  { cited: /\bDLMF\b/, entry: 'NIST DLMF' },
  { cited: /\bFolland\b/, entry: 'G. B. Folland' },
  { cited: /H(?:ö|o)rmander/, entry: 'L. Hörmander' },
  { cited: /\bFeynman\b|\bHibbs\b/, entry: 'R. P. Feynman & A. R. Hibbs' },
  { cited: /Zinn-Justin/, entry: 'J. Zinn-Justin' },
  { cited: /\bAbramowitz\b|\bStegun\b/, entry: 'Abramowitz & Stegun' },
  { cited: /\bQuine\b|\bHeydari\b/, entry: 'J. R. Quine' },
  { cited: /\bLerch\b/, entry: 'Lerch' },
  { cited: /Gel'?fand|\bYaglom\b/, entry: "I. M. Gel'fand & A. M. Yaglom" },
  { cited: /\bDunne\b/, entry: 'G. V. Dunne' },
  { cited: /\bApostol\b/, entry: 'T. M. Apostol' },
  { cited: /\bKirsten\b|\bMcKane\b/, entry: 'K. Kirsten, A. J. McKane' },
  { cited: /\bFendley\b|\bNayak\b/, entry: 'P. Fendley' },
  { cited: /\bWimmer\b/, entry: 'M. Wimmer' },
  { cited: /\bIsserlis\b/, entry: 'Isserlis' },
  { cited: /\bSylvester\b/, entry: "Sylvester's criterion" },
  { cited: /\bHorn & Johnson\b|Matrix Analysis/, entry: 'R. A. Horn & C. R. Johnson' },
  { cited: /\bHigham\b|Schur complement/, entry: 'N. J. Higham' },
  { cited: /Golub|Van Loan/, entry: 'Golub' },
  { cited: /Wick rotation/, entry: 'Wick rotation' },
  { cited: /facts of the trade|common practice/i, entry: 'Facts of the trade' },
  { cited: /Fresnel on the line/, entry: 'Fresnel on the line' },
  { cited: /\bmathjs\b/, entry: 'mathjs' },
  { cited: /\bmpmath\b/, entry: 'mpmath' },
  { cited: /\bsympy\b/, entry: 'sympy' },
];

function testFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (name === 'node_modules') return [];
    if (statSync(path).isDirectory()) return testFiles(path);
    return /\.(ts|mjs|js)$/.test(name) && path !== SELF ? [path] : [];
  });
}

test('every source keyword a test cites has an entry in docs/references.md', () => {
  const references = readFileSync(REFERENCES, 'utf8');
  const missing: string[] = [];
  let cited = 0;
  for (const file of testFiles(TEST_DIR)) {
    const text = readFileSync(file, 'utf8');
    for (const { cited: keyword, entry } of SOURCES) {
      if (!keyword.test(text)) continue;
      cited++;
      if (!references.includes(entry)) missing.push(`${relative(ROOT, file)} cites ${keyword} but docs/references.md has no "${entry}"`);
    }
  }
  assert.ok(cited > 0, 'the tests cite sources');
  assert.deepEqual(missing, []);
});

test('tests point to docs/references.md, not to a REFERENCES file the project does not have', () => {
  const stale = testFiles(TEST_DIR).filter((file) => /\bREFERENCES\b/.test(readFileSync(file, 'utf8'))).map((file) => relative(ROOT, file));
  assert.deepEqual(stale, []);
});

test('each entry of docs/references.md says which files cite it, and those files exist', () => {
  const references = readFileSync(REFERENCES, 'utf8');
  const entries = references.split(/^### /m).slice(1);
  assert.ok(entries.length > 0);
  for (const entry of entries) assert.match(entry, /Cited by:/, `entry without a "Cited by" line: ${entry.split('\n')[0]}`);
  for (const path of references.match(/\b(?:test|cas)\/[\w/.-]+\.ts\b/g) ?? []) {
    assert.ok(statSync(join(ROOT, path), { throwIfNoEntry: false })?.isFile(), `docs/references.md names ${path}, which does not exist`);
  }
});
