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
  const roles = (el: HTMLElement, role: string, panel?: string) =>
    el.querySelectorAll(`[data-testid="diagram"] ${panel ? `[data-panel="${panel}"] ` : ''}[data-role="${role}"]`);
  const legend = (el: HTMLElement, panel: string) => [...el.querySelectorAll(`section[data-panel="${panel}"] [data-role="legend-item"]`)].map((t) => t.textContent!.trim());
  const panels = (el: HTMLElement) => [...el.querySelectorAll('[data-testid="diagram-panel"]')].map((p) => p.getAttribute('data-panel'));

  it("draws an integral's eigenvalues with the principal cut in the eigenvalue plane, equal ones as one mark ×3", async () => {
    const el = await render(z3);
    // The real line alone is no panel of its own.
    expect(panels(el)).toEqual(['spectral']);
    const svg = el.querySelector('svg[data-panel="spectral"]')!;
    expect(svg.getAttribute('role')).toBe('img');
    expect(svg.getAttribute('tabindex')).toBe('0');
    expect(roles(el, 'cut', 'spectral').length).toBe(1);
    const eig = roles(el, 'eigenvalue', 'spectral');
    expect(eig.length).toBe(1);
    expect(eig[0].getAttribute('data-count')).toBe('3');
    expect(eig[0].querySelector('text')!.textContent).toBe('λ ×3');
    expect(eig[0].querySelector('title')!.textContent).toContain('argument 1.249');
    expect(roles(el, 'x-axis')[0].querySelectorAll('.tick').length).toBeGreaterThan(2);
    expect(roles(el, 'y-axis')[0].querySelectorAll('.tick').length).toBeGreaterThan(2);
    // The legend is outside the plot, in the page's text.
    expect(legend(el, 'spectral')).toEqual(['Principal cut of √', 'Eigenvalue of A']);
    expect(svg.querySelector('[data-role="legend-item"]')).toBeNull();
    expect(el.querySelector('section[data-panel="spectral"] h3')!.textContent).toContain('eigenvalues of A');
  });

  it('gives each plane a text alternative listing what is drawn', async () => {
    const el = await render(z3);
    const table = el.querySelector('[data-testid="diagram-description"]')!;
    expect(el.querySelector('svg')!.getAttribute('aria-describedby')).toBe(table.id);
    const text = table.textContent!;
    expect(text).toContain('Principal cut of √');
    expect(text).toContain('Eigenvalue λ3');
  });

  it('draws a continuation in its own planes: the parameter plane with events numbered as the steps, the eigenvalue plane with the tracks', async () => {
    const el = await render(cont);
    expect(panels(el)).toEqual(['variable', 'parameter', 'spectral']);
    expect(el.querySelector('section[data-panel="parameter"] h3')!.textContent).toContain('Parameter plane of k');
    expect(roles(el, 'continuation', 'parameter').length).toBe(1);
    expect(roles(el, 'continuation', 'spectral').length).toBe(0);
    const events = roles(el, 'event', 'parameter');
    expect(events.length).toBe(2);
    expect(events[0].getAttribute('data-step')).toBe('2');
    expect(events[0].querySelector('text')!.textContent).toBe('2');
    expect(events[0].querySelector('title')!.textContent).toContain('Cut crossed at k = i');
    // The end point has no step of its own: it is marked "end", not given a number the card does not have.
    expect(events[1].getAttribute('data-step')).toBeNull();
    expect(events[1].querySelector('text')!.textContent).toBe('end');
    expect(roles(el, 'track', 'spectral').length).toBe(1);
    expect(roles(el, 'sector', 'variable').length).toBe(2);
    expect(legend(el, 'parameter')).toEqual(['Continuation path', 'Event (number of its step)', 'End of the path']);
    expect(legend(el, 'variable')).toContain('Swept sector');
    expect(el.querySelector('[data-testid="export-svg"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="export-png"]')).not.toBeNull();
  });

  it('names the point the eigenvalues belong to and draws det A against the cut', async () => {
    const d = cont.diagram!;
    const el = await render({
      ...cont,
      diagram: { ...d, eigenvaluesAt: 'the end point, k = 2i', tracks: [...d.tracks, { label: 'det A', of: 'det', points: [{ re: 1, im: 0 }, { re: -1, im: 0.2 }] }], eigenvalues: [{ re: -0.2, im: 0.3, arg: 2.16 }] },
    });
    expect(el.querySelector('section[data-panel="spectral"] [data-testid="panel-subtitle"]')!.textContent).toContain('eigenvalues at the end point, k = 2i');
    expect(roles(el, 'det-track', 'spectral').length).toBe(1);
    expect(legend(el, 'spectral')).toContain('det A along the path');
    expect(el.querySelector('section[data-panel="spectral"] h3')!.textContent).toContain('det A');
  });

  it('is operable by keyboard: N steps through the marks and says what each is', async () => {
    const fixture = TestBed.createComponent(ComplexDiagram);
    fixture.componentRef.setInput('statement', cont);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const svg = el.querySelector<SVGSVGElement>('svg[data-panel="parameter"]')!;
    svg.dispatchEvent(new KeyboardEvent('keydown', { key: 'n', bubbles: true }));
    await fixture.whenStable();
    const note = el.querySelector('section[data-panel="parameter"] [data-testid="diagram-mark"]')!;
    expect(note.textContent).toContain('Mark 1 of 3');
    expect(note.getAttribute('aria-live')).toBe('polite');
    svg.dispatchEvent(new KeyboardEvent('keydown', { key: 'n', bubbles: true }));
    await fixture.whenStable();
    expect(note.textContent).toContain('Step 2: Cut crossed');
    expect(svg.querySelector('[data-role="focus-ring"]')).not.toBeNull();
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
