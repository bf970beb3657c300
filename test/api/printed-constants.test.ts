/**
 * Every printed result of the demo worksheets, the README's and the language guide's
 * examples and the all-step-kinds fixture: no constant printed as a long fraction that
 * approximates an irrational number, no floating-point noise next to exact terms, and
 * every floating-point number in a result marked with "≈". (No server is started.)
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { evaluateWorksheet } from '../../cas/index.js';
import { renderStep } from '../../shared/record/render.js';
import { DEMO_WORKSHEETS } from '../../server/db/seeders/demo-data.js';
import { exampleSources } from '../../scripts/render-examples.js';

const worksheets: [string, string][] = [
  ...DEMO_WORKSHEETS.map((w) => [`demo: ${w.title}`, w.source] as [string, string]),
  ...[...exampleSources(readFileSync('README.md', 'utf8'))].map(([f, s]) => [`README ${f}`, s] as [string, string]),
  ...[...exampleSources(readFileSync('docs/worksheet-language.md', 'utf8'))].map(([f, s]) => [`guide ${f}`, s] as [string, string]),
  ['fixture all-step-kinds', readFileSync('test/fixtures/all-step-kinds.swk', 'utf8')],
];

const LONG_FRACTION = /\b\d{7,}\s*\*?\s*i?\s*\/\s*\d{7,}\b/;
const NOISE = /\d(\.\d+)?e-(1[2-9]|[2-9]\d)\b\*?(pi|i)?/;
/** A decimal number (with a point or an exponent) not preceded by ≈ in its part of the text. */
function unmarkedDecimal(text: string): string | null {
  for (const m of text.matchAll(/-?\d+\.\d+(e-?\d+)?|\d+e-?\d+/g)) {
    const before = text.slice(0, m.index);
    const segment = before.slice(Math.max(before.lastIndexOf(','), before.lastIndexOf(';'), before.lastIndexOf('('), before.lastIndexOf('=')) + 1);
    if (!segment.includes('≈')) return `${m[0]} in "${text}"`;
  }
  return null;
}

test('printed results: no long fractions, no float noise, floats marked with ≈ (demo worksheets, README and guide examples, fixture)', () => {
  assert.ok(worksheets.length >= 10, `${worksheets.length} worksheets`);
  for (const [where, source] of worksheets) {
    const report = evaluateWorksheet(source);
    for (const s of report.statements) {
      if (!s.result) continue;
      const texts = [s.result.text, s.result.latex];
      for (const t of texts) {
        assert.doesNotMatch(t, LONG_FRACTION, `${where}, line ${s.line}: ${t}`);
        assert.doesNotMatch(t, NOISE, `${where}, line ${s.line}: ${t}`);
      }
      const bad = unmarkedDecimal(s.result.text);
      assert.equal(bad, null, `${where}, line ${s.line}: a floating-point number without ≈: ${bad}`);
      for (const st of s.steps) {
        const r = renderStep(st);
        assert.doesNotMatch(r.text, LONG_FRACTION, `${where}, line ${s.line}, ${st.kind}: ${r.text}`);
        assert.doesNotMatch(r.text, /e-\d\d\*pi/, `${where}, line ${s.line}, ${st.kind}: noise in an angle: ${r.text}`);
      }
    }
  }
});

test('the checks above catch what they are for', () => {
  assert.match('131836323*i/186444716 + 131836323/186444716', LONG_FRACTION);
  assert.match('sum of arg = -5.301e-17*pi', NOISE);
  assert.notEqual(unmarkedDecimal('Z = 2.96521847838882'), null);
  assert.equal(unmarkedDecimal('≈ 2.96521847838882 - 0.5*i'), null);
});
