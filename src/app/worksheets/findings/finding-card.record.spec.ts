import { TestBed } from '@angular/core/testing';
import { STEP_KINDS, worksheetReport, type StatementReport } from '@shared/evaluation';
import { renderStep } from '@shared/record/render';
import reportJson from '../testing/all-step-kinds.report.json';
import { FindingCard } from './finding-card';

// The evaluated record of test/fixtures/all-step-kinds.swk, one statement per card; the
// node test test/api/record-renderers.test.ts keeps the JSON equal to a fresh evaluation
// and checks the command line and the LaTeX export against the same renderStep.
const REPORT = worksheetReport.parse(reportJson);

/** Whitespace as the browser lays it out: runs of spaces and line breaks are one space. */
const squash = (s: string) => s.replace(/\s+/g, ' ').trim();

describe('FindingCard renders every step kind of the record', () => {
  async function cardText(st: StatementReport): Promise<string> {
    const fixture = TestBed.createComponent(FindingCard);
    fixture.componentRef.setInput('statement', st);
    await fixture.whenStable();
    return squash((fixture.nativeElement as HTMLElement).textContent ?? '');
  }

  it('the fixture holds every step kind', () => {
    const seen = new Set(REPORT.statements.flatMap((s) => s.steps.map((step) => step.kind)));
    expect(STEP_KINDS.filter((k) => !seen.has(k))).toEqual([]);
  });

  for (const st of REPORT.statements) {
    it(`line ${st.line} (${st.kind}${st.name ? ` ${st.name}` : ''}) shows the sentence of each of its steps`, async () => {
      const text = await cardText(st);
      const missing = st.steps.filter((step) => !text.includes(squash(renderStep(step).text))).map((step) => step.kind);
      expect(missing).toEqual([]);
    });
  }
});
