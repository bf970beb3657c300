import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { StatementReport } from '@shared/evaluation';
import { FIXTURE_REPORT } from '../testing/report-fixture';
import { review, statementReview } from '../../reviews/testing';
import { renderStep } from '@shared/record/render';
import { FindingCard } from './finding-card';
import { badgesOf, convergenceBadge, numericBadge } from './finding-view';

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
    expect(result.dataset['latex']).toBe(z3.result!.latex);
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
  it('a missing numeric check says not run', () => {
    expect(numericBadge(cont)!.label).toBe('Numeric check not run');
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
