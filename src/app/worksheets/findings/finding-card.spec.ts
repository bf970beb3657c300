import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { StatementReport } from '@shared/evaluation';
import { FIXTURE_REPORT } from '../testing/report-fixture';
import { review, statementReview } from '../../reviews/testing';
import { renderStep } from '@shared/record/render';
import { FindingCard } from './finding-card';
import { badgesOf, checksOf, convergenceBadge, isProblem, nameLatex, numericBadge, resultLatex, resultText, verdictView, verifyLineFor } from './finding-view';
import { paramEntries } from './param-summary';
import reportJson from '../testing/all-step-kinds.report.json';
import { worksheetReport } from '@shared/evaluation';

// The evaluated record of test/fixtures/all-step-kinds.swk (kept equal to a fresh evaluation by test/api/record-renderers.test.ts).
const ALL = worksheetReport.parse(reportJson).statements;
const at = (line: number) => ALL.find((s) => s.line === line)!;

const [param, z3, cont, bad] = FIXTURE_REPORT.statements;

describe('FindingCard', () => {
  async function render(st: StatementReport, selected = false): Promise<{ fixture: ComponentFixture<FindingCard>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(FindingCard);
    fixture.componentRef.setInput('statement', st);
    fixture.componentRef.setInput('selected', selected);
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }
  const badge = (el: HTMLElement, kind: string) => el.querySelector<HTMLElement>(`[data-badge="${kind}"]`);

  it('carries its line and shows the result through KaTeX', async () => {
    const { el } = await render(z3);
    expect(el.getAttribute('data-testid')).toBe('finding-card');
    expect(el.getAttribute('data-line')).toBe('2');
    const result = el.querySelector<HTMLElement>('[data-testid="finding-result"]')!;
    // The name in the math font, upright as one word (never an italic product Z·3).
    expect(result.dataset['latex']).toBe(`\\mathrm{Z3} = ${z3.result!.latex}`);
    await vi.waitFor(() => expect(result.dataset['rendered']).toBe('true'), { timeout: 5000 });
    expect(result.querySelector('.katex')).not.toBeNull();
  });

  it('says a sampled verdict was checked at N points, not proved, with an icon and a word', async () => {
    const { el } = await render(z3);
    const conv = badge(el, 'convergence')!;
    expect(conv.textContent).toContain('Converges absolutely');
    expect(conv.textContent).toContain('checked at 64 points, not proved');
    expect(conv.querySelector('.material-symbols-outlined')!.textContent!.trim()).toBe('check_circle');
    expect(conv.className).toContain('tone-caution');
  });

  it('says when the principal root is flipped, and why', async () => {
    const { el } = await render(z3);
    expect(badge(el, 'branch')!.textContent).toContain('Principal root flipped');
    const branchStep = z3.steps.find((s) => s.kind === 'branch')!;
    expect(el.querySelector('[data-testid="branch-reason"]')!.textContent!.trim()).toContain(renderStep(branchStep).text);
  });

  it('shows the numeric check and, until reviews arrive, an unreviewed badge', async () => {
    const { el } = await render(z3);
    expect(badge(el, 'numeric')!.textContent).toContain('Numeric check agrees');
    const rb = el.querySelector<HTMLElement>('[data-testid="review-badge"]')!;
    expect(rb.textContent).toContain('Unreviewed');
    expect(rb.dataset['status']).toBe('unreviewed');
  });

  it('shows the review status with an icon and a word, marks a stale verdict with its version, and opens the thread', async () => {
    const { fixture, el } = await render(z3);
    const opened: number[] = [];
    fixture.componentInstance.openReview.subscribe((l) => opened.push(l));
    fixture.componentRef.setInput('review', statementReview({ status: 'confirmed', reviews: [review({ status: 'confirmed' })] }));
    await fixture.whenStable();
    const rb = el.querySelector<HTMLButtonElement>('[data-testid="review-badge"]')!;
    expect(rb.dataset['status']).toBe('confirmed');
    expect(rb.textContent).toContain('Confirmed');
    expect(rb.querySelector('.material-symbols-outlined')!.textContent!.trim()).toBe('verified_user');
    rb.click();
    expect(opened).toEqual([2]);

    fixture.componentRef.setInput('review', statementReview({ status: 'unreviewed', reviews: [review({ status: 'disputed', stale: true, version: 1 })] }));
    await fixture.whenStable();
    expect(rb.dataset['status']).toBe('unreviewed');
    expect(rb.dataset['stale']).toBe('true');
    expect(el.querySelector('[data-testid="review-stale"]')!.textContent).toContain('stale: disputed on v1');
  });

  it('has no review badge in read-only mode (the referee view)', async () => {
    const fixture = TestBed.createComponent(FindingCard);
    fixture.componentRef.setInput('statement', z3);
    fixture.componentRef.setInput('reviewable', false);
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="review-badge"]')).toBeNull();
  });

  it('numbers the steps, each with its sentence and formula, open when selected', async () => {
    const { el } = await render(z3, true);
    const details = el.querySelector('details')!;
    expect(details.open).toBe(true);
    const steps = el.querySelectorAll('[data-testid="finding-step"]');
    expect(steps.length).toBe(z3.steps.length);
    expect(el.querySelector('ol')).not.toBeNull();
    // Every sentence and formula comes from the one renderer of steps.
    z3.steps.forEach((step, i) => {
      const { text, latex } = renderStep(step);
      expect(steps[i].querySelector('.sentence')!.textContent).toBe(text);
      expect((steps[i].querySelector('[data-latex]') as HTMLElement | null)?.dataset['latex'] ?? '').toBe(latex);
    });
  });

  it('shows an error in plain words with its line and column', async () => {
    const { el } = await render(bad);
    expect(el.getAttribute('data-status')).toBe('error');
    expect(el.classList.contains('problem')).toBe(true);
    const error = el.querySelector('[data-testid="finding-error"]')!;
    expect(error.textContent).toContain('Line 4, column 29');
    expect(error.textContent).toContain('A closing parenthesis is missing');
    expect(el.querySelector('[data-testid="finding-result"]')).toBeNull();
  });

  it('emits the line when its head is clicked', async () => {
    const { fixture, el } = await render(cont);
    const lines: number[] = [];
    fixture.componentInstance.select.subscribe((l) => lines.push(l));
    el.querySelector<HTMLButtonElement>('button.goto')!.click();
    expect(lines).toEqual([3]);
  });

  it('gives a param no verdict badges', () => {
    expect(badgesOf(param)).toEqual([]);
  });
});

describe('badge wording', () => {
  it('a proved verdict says proved', () => {
    expect(convergenceBadge(cont)!.label).toBe('Converges absolutely · proved');
  });
  it('a result without a numeric check says not run; a continuation has no numeric badge', () => {
    expect(numericBadge(at(17))!.label).toBe('Numeric check not run');
    expect(numericBadge(cont)).toBeNull();
  });
  it("a result's badge reads the verify lines for it", () => {
    const z = at(7);
    const checks = checksOf(z, ALL);
    expect(checks.map((c) => c.line)).toEqual([10]);
    expect(numericBadge(z, checks)).toMatchObject({ label: 'Numeric check agrees', tone: 'good' });
    expect(numericBadge(z, checks)!.detail).toContain('verify on line 10');
    expect(numericBadge(z, [{ ...checks[0]!, agrees: false, status: 'failed' }])!.label).toBe('Numeric check disagrees');
    // The continuation and the limit of Z are not Z's checks, nor is verify Z a check of G.
    expect(checksOf(at(13), ALL)).toEqual([]);
    expect(checksOf(at(6), ALL)).toEqual([]);
  });
  it('reads the typed agreement, never words in the step text', () => {
    const disagreeing = z3.steps.map((s) => (s.kind === 'numeric-agreement' ? { ...s, agrees: false } : s));
    expect(numericBadge({ ...z3, steps: disagreeing })!.label).toBe('Numeric check disagrees');
    expect(numericBadge({ ...z3, steps: [...z3.steps, { kind: 'note', text: 'The numbers disagree here.' }] })!.label).toBe('Numeric check agrees');
    const verify = { ...cont, kind: 'verify' as const, steps: [] };
    expect(numericBadge({ ...verify, agrees: false, status: 'failed' as const })!.label).toBe('Numeric check disagrees');
    expect(numericBadge({ ...verify, agrees: true })!.label).toBe('Numeric check agrees');
  });
  it('divergent and oscillatory verdicts have their own icon and word', () => {
    expect(convergenceBadge({ ...z3, convergence: 'divergent', proof: 'proved' })).toMatchObject({ icon: 'cancel', label: 'Diverges · proved' });
    expect(convergenceBadge({ ...z3, convergence: 'oscillatory', proof: 'proved' })!.icon).toBe('waves');
  });
});

describe('card head verdicts', () => {
  it('a rotation that is not allowed says so, with its icon, and counts as a problem', () => {
    const gb = at(12);
    expect(gb.legal).toBe(false);
    expect(gb.status).toBe('ok');
    expect(verdictView(gb)).toMatchObject({ icon: 'block', label: 'Not allowed', tone: 'bad', problem: true });
    expect(isProblem(gb)).toBe(true);
  });
  it('a continuation shows its sheet, a comparison its phase, an expectation and a check their verdicts', () => {
    expect(verdictView(at(13))).toMatchObject({ label: 'Minus the principal sheet', problem: false });
    const phase = verdictView(at(16));
    expect(phase.label).toBe('Equal up to the phase');
    expect(phase.condition!.latex).toBe('e^{i\\pi/4}');
    expect(verdictView(at(9)).label).toBe('Holds');
    expect(verdictView(at(10)).label).toBe('Agrees');
    expect(verdictView(at(6)).label).toBe('Done');
  });
  it('piecewise verdicts carry their exact condition; divergent and failed are problems', () => {
    const conv = at(7).steps.find((s) => s.kind === 'convergence')!;
    const piecewise = {
      ...at(7), convergence: 'piecewise' as const,
      steps: [{ ...conv, verdict: 'piecewise' as const, regions: [{ condition: { text: 'k > 1', latex: 'k > 1' }, holds: true, verdict: 'absolute' as const }, { condition: { text: 'k < 1', latex: 'k < 1' }, holds: false, verdict: 'divergent' as const }] }],
    };
    expect(verdictView(piecewise)).toMatchObject({ label: 'Converges only for', condition: { text: 'k > 1' }, problem: false });
    expect(verdictView({ ...at(6), convergence: 'divergent' })).toMatchObject({ label: 'Divergent', problem: true });
    expect(verdictView({ ...at(9), status: 'failed' })).toMatchObject({ label: 'Does not hold', problem: true });
  });
  it('an asymptotic limit reads "~", a finite one "=" under lim', () => {
    const lim = at(19);
    expect(resultLatex(lim)).toMatch(/^\\lim_\{\\mathrm\{lam\} \\to 0\} Z = /);
    const step = lim.steps[0]!;
    const asym = { ...lim, steps: [{ ...step, outcome: 'asymptotic' as const }] };
    expect(resultLatex(asym)).toMatch(/^Z \\sim /);
  });
  it('a comparison reads as the ratio of its two names, never as one run-together name', () => {
    const cmp = ALL.find((s) => s.kind === 'compare' && s.result)!;
    const [a, b] = cmp.name!.split(', ');
    expect(resultLatex(cmp)).toBe(`\\frac{${nameLatex(a!)}}{${nameLatex(b!)}} = ${cmp.result!.latex}`);
    expect(resultText(cmp).startsWith(`${a}/${b} `)).toBe(true);
  });
  it('names: one letter italic, longer names upright, an underscore a subscript', () => {
    expect(nameLatex('Z')).toBe('Z');
    expect(nameLatex('GF')).toBe('\\mathrm{GF}');
    expect(nameLatex('Z_rot')).toBe('Z_{\\mathrm{rot}}');
  });
  it('a numeric check line names the parameters at the simplest value of their domain', () => {
    const params = [{ name: 'k', domain: 'positive', line: 2 }, { name: 'lam', domain: 'real', line: 3 }, { name: 'w', domain: 'positive', line: 4 }];
    expect(verifyLineFor(at(17), params)).toBe('verify G1 at k = 1, lam = 1/2, w = 1');
  });
  it('parameter lines become entries of one summary, names set as names', () => {
    const entries = paramEntries(ALL);
    expect(entries.map((e) => e.line)).toEqual([2, 3, 4]);
    expect(entries[1]!.latex).toBe('\\mathrm{lam} \\in \\mathbb{R}');
    expect(entries[0]!.text).toBe('k is a positive real number.');
  });
});

describe('FindingCard head, review badge and one-click check', () => {
  async function render(st: StatementReport, inputs: Record<string, unknown> = {}) {
    const fixture = TestBed.createComponent(FindingCard);
    fixture.componentRef.setInput('statement', st);
    for (const [k, v] of Object.entries(inputs)) fixture.componentRef.setInput(k, v);
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }
  it('shows "Not allowed" in the head of an illegal rotation, never "Done"', async () => {
    const { el } = await render(at(12));
    const head = el.querySelector('[data-testid="card-verdict"]')!;
    expect(head.textContent).toContain('Not allowed');
    expect(head.textContent).not.toContain('Done');
    expect(head.className).toContain('tone-bad');
    expect(el.classList.contains('problem')).toBe(true);
  });
  it('puts review badges on results and checks only', async () => {
    for (const line of [2, 5]) expect((await render(at(line))).el.querySelector('[data-testid="review-badge"]')).toBeNull();
    expect((await render(bad)).el.querySelector('[data-testid="review-badge"]')).toBeNull();
    // A rotation that is not allowed has no result to review.
    expect((await render(at(12))).el.querySelector('[data-testid="review-badge"]')).toBeNull();
    // A note has no verdict in its head.
    expect((await render(at(5))).el.querySelector('[data-testid="card-verdict"]')).toBeNull();
    expect((await render(at(7))).el.querySelector('[data-testid="review-badge"]')).not.toBeNull();
    expect((await render(at(9))).el.querySelector('[data-testid="review-badge"]')).not.toBeNull();
  });
  it('offers a numeric check on a result that has none, and says which result', async () => {
    const { fixture, el } = await render(at(17), { canCheck: true });
    const asked: string[] = [];
    fixture.componentInstance.checkNumerically.subscribe((s) => asked.push(s.name!));
    el.querySelector<HTMLButtonElement>('[data-testid="check-numerically"]')!.click();
    expect(asked).toEqual(['G1']);
    const z = at(7);
    expect((await render(z, { canCheck: true, checks: checksOf(z, ALL) })).el.querySelector('[data-testid="check-numerically"]')).toBeNull();
    expect((await render(at(17), { canCheck: false })).el.querySelector('[data-testid="check-numerically"]')).toBeNull();
  });
  it('a badge is a button: pressing it shows its sentence, pressing again hides it', async () => {
    const { fixture, el } = await render(z3);
    const b = el.querySelector<HTMLButtonElement>('button[data-badge="convergence"]')!;
    expect(b.getAttribute('aria-expanded')).toBe('false');
    b.click();
    await fixture.whenStable();
    expect(b.getAttribute('aria-expanded')).toBe('true');
    expect(el.querySelector('[data-testid="badge-detail"]')!.textContent).toContain('Convergence: Converges absolutely');
    b.click();
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="badge-detail"]')).toBeNull();
  });
});
