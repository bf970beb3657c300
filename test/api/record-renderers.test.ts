// The command line, the LaTeX export and the findings card word the same typed steps:
// every step of a worksheet holding every step kind is rendered once by renderStep, and
// its sentence (and its LaTeX, for the export) must appear in each output. The card's
// half is src/app/worksheets/findings/finding-card.record.spec.ts, which reads the
// evaluated report from src/app/worksheets/testing/all-step-kinds.report.json; this file
// checks that JSON against a fresh evaluation so it cannot go stale.
// No server or database is needed.
//
// Regenerate the JSON after a change to the core:
//   SHEETWISE_WRITE_REPORT_FIXTURE=1 node --import tsx --test test/api/record-renderers.test.ts
import assert from 'node:assert/strict';
import { readFileSync, writeFileSync } from 'node:fs';
import { test } from 'node:test';
import { evaluateWorksheet } from '../../cas/index.js';
import { formatReport } from '../../cas/cli/format.js';
import { STEP_KINDS, worksheetReport, type StatementReport, type Step, type WorksheetReport } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';
import { latexAppendix, texSource, texText } from '../../server/exports/latex.js';

const FIXTURE = new URL('../fixtures/all-step-kinds.swk', import.meta.url);
const REPORT_JSON = new URL('../../src/app/worksheets/testing/all-step-kinds.report.json', import.meta.url);

const source = readFileSync(FIXTURE, 'utf8');
const report: WorksheetReport = evaluateWorksheet(source);

if (process.env['SHEETWISE_WRITE_REPORT_FIXTURE']) {
  writeFileSync(REPORT_JSON, `${JSON.stringify({ ...report, file: 'all-step-kinds.swk' }, null, 1)}\n`);
}

const where = (s: StatementReport, step: Step) => `line ${s.line} (${s.kind} ${s.name ?? ''}), step ${step.kind}`;
const allSteps = (r: WorksheetReport) => r.statements.flatMap((s) => s.steps.map((step) => ({ s, step })));

test('the fixture evaluates without errors and holds every step kind', () => {
  const bad = report.statements.filter((s) => s.status === 'error');
  assert.deepEqual(bad.map((s) => `line ${s.line}: ${s.error?.message}`), []);
  const seen = new Set(allSteps(report).map(({ step }) => step.kind));
  assert.deepEqual(STEP_KINDS.filter((k) => !seen.has(k)), [], 'step kinds missing from test/fixtures/all-step-kinds.swk');
});

test('the command line prints every step as renderStep words it', () => {
  const printed = formatReport(report);
  const missing = allSteps(report)
    .filter(({ step }) => !printed.includes(renderStep(step).text))
    .map(({ s, step }) => where(s, step));
  assert.deepEqual(missing, [], 'steps whose sentence formatReport does not print');
});

test('the LaTeX export holds every step as text and as LaTeX', () => {
  const tex = latexAppendix({ title: 'All step kinds', version: 1, report, reviews: [] });
  const missing: string[] = [];
  for (const { s, step } of allSteps(report)) {
    const { text, latex } = renderStep(step);
    // a note line prints once, as it was typed (its step would repeat it)
    if (s.kind === 'note' && step.kind === 'note') { if (!tex.includes(texSource(s.source))) missing.push(`${where(s, step)}: source`); continue; }
    if (!tex.includes(texText(text))) missing.push(`${where(s, step)}: text`);
    if (latex && !tex.includes(latex)) missing.push(`${where(s, step)}: latex`);
  }
  assert.deepEqual(missing, [], 'steps missing from latexAppendix');
});

/** The report without what varies between runs (quadrature wall-clock time). */
function comparable(r: WorksheetReport): unknown {
  return JSON.parse(JSON.stringify(r.statements), (key, value) => (key === 'timeMs' ? undefined : value));
}

test("the card's fixture (all-step-kinds.report.json) equals a fresh evaluation of the worksheet", () => {
  const stored = worksheetReport.parse(JSON.parse(readFileSync(REPORT_JSON, 'utf8')));
  assert.deepEqual(
    comparable(stored),
    comparable(report),
    'src/app/worksheets/testing/all-step-kinds.report.json is stale: regenerate it (see the head of this file)',
  );
  const seen = new Set(allSteps(stored).map(({ step }) => step.kind));
  assert.deepEqual(STEP_KINDS.filter((k) => !seen.has(k)), []);
});
