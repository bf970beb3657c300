import { TestBed } from '@angular/core/testing';
import { FIXTURE_REPORT } from '../testing/report-fixture';
import { ComplexDiagram } from './complex-diagram';
import { diagramFor, formatComplex } from './diagram-data';

const [param, z3, cont] = FIXTURE_REPORT.statements;

describe('ComplexDiagram', () => {
  async function render(st: unknown) {
    const fixture = TestBed.createComponent(ComplexDiagram);
    fixture.componentRef.setInput('statement', st);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }
  const roles = (el: HTMLElement, role: string) => el.querySelectorAll(`[data-testid="diagram"] [data-role="${role}"]`);
  const legend = (el: HTMLElement) => [...el.querySelectorAll('[data-role="legend-item"] text')].map((t) => t.textContent);

  it('draws the real contour, the principal cut and the eigenvalues of an integral', async () => {
    const el = await render(z3);
    const svg = el.querySelector('[data-testid="diagram"]')!;
    expect(svg.getAttribute('role')).toBe('img');
    expect(roles(el, 'contour').length).toBe(1);
    expect(roles(el, 'cut').length).toBe(1);
    expect(roles(el, 'eigenvalue').length).toBe(3);
    expect(roles(el, 'x-axis')[0].querySelectorAll('.tick').length).toBeGreaterThan(2);
    expect(roles(el, 'y-axis')[0].querySelectorAll('.tick').length).toBeGreaterThan(2);
    expect(legend(el)).toEqual(['Real contour', 'Principal cut of √', 'Eigenvalue of A']);
    expect(roles(el, 'eigenvalue')[0].querySelector('title')!.textContent).toContain('argument 1.249');
  });

  it('gives a text alternative listing what is drawn', async () => {
    const el = await render(z3);
    const table = el.querySelector('[data-testid="diagram-description"]')!;
    expect(el.querySelector('svg')!.getAttribute('aria-describedby')).toBe(table.id);
    const text = table.textContent!;
    expect(text).toContain('Real contour');
    expect(text).toContain('Principal cut of √');
    expect(text).toContain('Eigenvalue λ3');
  });

  it('draws a continuation path with its events numbered to match the steps, tracks and the swept sector', async () => {
    const el = await render(cont);
    expect(roles(el, 'continuation').length).toBe(1);
    const events = roles(el, 'event');
    expect(events.length).toBe(2);
    expect(events[0].getAttribute('data-step')).toBe('2');
    expect(events[0].querySelector('text')!.textContent).toBe('2');
    expect(events[0].querySelector('title')!.textContent).toContain('Cut crossed at k = i');
    expect(roles(el, 'track').length).toBe(1);
    expect(roles(el, 'sector').length).toBe(2);
    expect(legend(el)).toContain('Continuation path');
    expect(legend(el)).toContain('Event (step number)');
    expect(legend(el)).toContain('Swept sector');
    expect(el.querySelector('[data-testid="export-svg"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="export-png"]')).not.toBeNull();
  });

  it('draws only what the report gives: no diagram data, nothing drawn', () => {
    const { diagram: _, ...bare } = z3;
    expect(diagramFor(bare)).toBeNull();
    expect(diagramFor({ ...z3, diagram: { contours: [], sectors: [], cuts: [], paths: [], tracks: [], eigenvalues: [] } })).toBeNull();
    expect(diagramFor(z3)).toBe(z3.diagram);
  });

  it('says what to select when the statement has nothing to draw', async () => {
    const el = await render(param);
    expect(el.querySelector('[data-testid="diagram"]')).toBeNull();
    expect(el.querySelector('[data-testid="diagram-empty"]')).not.toBeNull();
    expect(diagramFor(param)).toBeNull();
  });

  it('formats complex numbers for people', () => {
    expect(formatComplex({ re: 0, im: 1 })).toBe('i');
    expect(formatComplex({ re: 1 / 3, im: -1 })).toBe('0.333 − i');
    expect(formatComplex({ re: -2, im: 0 })).toBe('−2');
  });
});
