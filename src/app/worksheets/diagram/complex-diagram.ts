import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  effect,
  inject,
  input,
  signal,
  untracked,
  viewChildren,
} from '@angular/core';
import { axisBottom, axisLeft, line as d3line, scaleLinear, select, zoom, zoomIdentity, type ScaleLinear, type ZoomBehavior } from 'd3';
import type { DiagramData } from '@shared/diagram';
import type { ComplexValue } from '@shared/evaluation';
import { ThemeStore } from '../../core/theme/theme-store';
import { cluster, diagramFor, eventWord, formatComplex, panelsOf, type DiagramPanel, type DiagramStatement } from './diagram-data';

const W = 420;
const H = 320;
const M = { top: 12, right: 12, bottom: 34, left: 46 };

interface Palette {
  bg: string;
  ink: string;
  grid: string;
  axis: string;
  contour: string;
  rotated: string;
  cut: string;
  sector: string;
  sectorBad: string;
  path: string;
  event: string;
  track: string;
  det: string;
  eigen: string;
}

const LIGHT: Palette = {
  bg: '#fffdf9', ink: '#0d2a36', grid: '#e7e2d6', axis: '#8a8577', contour: '#0b4f63', rotated: '#2b8a9e',
  cut: '#9c2f24', sector: 'rgba(11, 79, 99, 0.12)', sectorBad: 'rgba(156, 47, 36, 0.14)', path: '#b5651d',
  event: '#6b3a0f', track: '#5b4a8a', det: '#2d6a4f', eigen: '#0d2a36',
};
const DARK: Palette = {
  bg: '#12232b', ink: '#e9e4d8', grid: '#22363f', axis: '#7f9097', contour: '#97cee6', rotated: '#5fc4d8',
  cut: '#ff8a7a', sector: 'rgba(151, 206, 230, 0.16)', sectorBad: 'rgba(255, 138, 122, 0.18)', path: '#e8a868',
  event: '#f6d2ac', track: '#c6b8ef', det: '#8fd1ad', eigen: '#e9e4d8',
};

let diagramCount = 0;

/** A row of the text alternative, one per drawn thing. */
interface DescriptionRow {
  what: string;
  where: string;
}

/** A mark the keyboard can step to (N / P), with its sentence. */
interface Mark {
  x: number;
  y: number;
  text: string;
}

interface PanelState {
  zoom: ZoomBehavior<SVGSVGElement, unknown>;
  marks: Mark[];
}

/**
 * The complex planes of one statement, drawn with d3, each plane in a panel of its own with its
 * title: the integration variable's plane (contours, swept sectors), the parameter plane
 * (continuation path and its events numbered as the steps of the record) and the plane of the
 * eigenvalues of A and det A (tracks, the principal cut, the eigenvalues at the point named).
 * Legends sit outside the plots; marks that fall together are drawn once with their count ("×3").
 * Each plot takes the focus: arrows pan, + and − zoom, 0 resets, N and P step through the marks.
 */
@Component({
  selector: 'app-complex-diagram',
  templateUrl: './complex-diagram.html',
  styleUrl: './complex-diagram.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ComplexDiagram {
  private readonly theme = inject(ThemeStore);
  private readonly svgRefs = viewChildren<ElementRef<SVGSVGElement>>('svg');
  private readonly tipRefs = viewChildren<ElementRef<HTMLElement>>('tip');

  readonly statement = input<DiagramStatement | null>(null);

  protected readonly data = computed(() => diagramFor(this.statement()));
  protected readonly panels = computed(() => panelsOf(this.data()));
  protected readonly title = computed(() => {
    const st = this.statement();
    return st ? `Complex planes for line ${st.line}${st.name ? ` (${st.name})` : ''}` : 'Complex planes';
  });
  protected readonly legends = computed(() => this.panels().map((p) => legendOf(p.data)));
  protected readonly rows = computed(() => this.panels().map((p) => describe(p.data)));
  /** Per panel: zoomed away from the start, and the mark the keyboard is on (its sentence). */
  protected readonly zoomed = signal<boolean[]>([]);
  protected readonly current = signal<(string | null)[]>([]);
  /** A prefix for the ids of this diagram's titles and descriptions. */
  protected readonly uid = `plane-${++diagramCount}`;
  protected readonly palette = computed(() => (this.theme.dark() ? DARK : LIGHT));
  protected readonly W = W;
  protected readonly H = H;

  private states: PanelState[] = [];
  private readonly markIndex: number[] = [];

  constructor() {
    effect(() => {
      const panels = this.panels();
      const dark = this.theme.dark();
      const svgs = this.svgRefs().map((r) => r.nativeElement);
      if (svgs.length === panels.length && panels.length) untracked(() => this.renderAll(svgs, panels, dark ? DARK : LIGHT));
    });
    inject(DestroyRef).onDestroy(() => {
      for (const r of this.svgRefs()) select(r.nativeElement).on('.zoom', null);
    });
  }

  protected resetZoom(i: number): void {
    const svg = this.svgRefs()[i]?.nativeElement;
    const st = this.states[i];
    if (svg && st) select(svg).call(st.zoom.transform, zoomIdentity);
  }

  /** Keys on a focused plot: arrows pan, + and − zoom, 0 resets, N and P step through the marks, Esc hides the mark's note. */
  protected onKey(i: number, ev: KeyboardEvent): void {
    const svg = this.svgRefs()[i]?.nativeElement;
    const st = this.states[i];
    if (!svg || !st) return;
    const sel = select(svg);
    const step = 40;
    switch (ev.key) {
      case 'ArrowLeft': sel.call(st.zoom.translateBy, step, 0); break;
      case 'ArrowRight': sel.call(st.zoom.translateBy, -step, 0); break;
      case 'ArrowUp': sel.call(st.zoom.translateBy, 0, step); break;
      case 'ArrowDown': sel.call(st.zoom.translateBy, 0, -step); break;
      case '+': case '=': sel.call(st.zoom.scaleBy, 1.25); break;
      case '-': case '_': sel.call(st.zoom.scaleBy, 0.8); break;
      case '0': this.resetZoom(i); break;
      case 'n': case 'N': case 'p': case 'P': {
        if (!st.marks.length) return;
        const prev = this.markIndex[i] ?? -1;
        const next = ev.key.toLowerCase() === 'n' ? (prev + 1) % st.marks.length : (prev - 1 + st.marks.length) % st.marks.length;
        this.markIndex[i] = next;
        this.setCurrent(i, `Mark ${next + 1} of ${st.marks.length}: ${st.marks[next]!.text}`);
        this.ring(svg, st.marks[next]!);
        break;
      }
      case 'Escape':
        if (this.current()[i] === null || this.current()[i] === undefined) return;
        this.setCurrent(i, null);
        select(svg).selectAll('[data-role="focus-ring"]').remove();
        break;
      default:
        return;
    }
    ev.preventDefault();
  }

  private setCurrent(i: number, text: string | null): void {
    this.current.update((c) => {
      const out = [...c];
      out[i] = text;
      return out;
    });
  }

  private ring(svg: SVGSVGElement, m: Mark): void {
    const sel = select(svg);
    sel.selectAll('[data-role="focus-ring"]').remove();
    sel.append('circle').attr('data-role', 'focus-ring').attr('cx', m.x).attr('cy', m.y).attr('r', 14).attr('fill', 'none')
      .attr('stroke', 'currentColor').attr('stroke-width', 2).attr('stroke-dasharray', '3 2').attr('pointer-events', 'none');
  }

  protected exportSvg(): void {
    const text = this.serialize();
    if (text) download(new Blob([text], { type: 'image/svg+xml' }), `${this.fileName()}.svg`);
  }

  protected exportPng(): void {
    const text = this.serialize();
    if (!text) return;
    const n = this.panels().length;
    const url = URL.createObjectURL(new Blob([text], { type: 'image/svg+xml' }));
    const img = new Image();
    img.onload = () => {
      const scale = 2;
      const canvas = document.createElement('canvas');
      canvas.width = W * n * scale;
      canvas.height = (H + TITLE_H) * scale;
      const ctx = canvas.getContext('2d');
      if (!ctx) return;
      ctx.scale(scale, scale);
      ctx.drawImage(img, 0, 0, W * n, H + TITLE_H);
      URL.revokeObjectURL(url);
      canvas.toBlob((blob) => blob && download(blob, `${this.fileName()}.png`), 'image/png');
    };
    img.src = url;
  }

  private fileName(): string {
    const st = this.statement();
    return `sheetwise-line-${st?.line ?? 0}${st?.name ? `-${st.name}` : ''}`;
  }

  /** The panels side by side in one SVG document, each with its title above it. */
  private serialize(): string | null {
    const svgs = this.svgRefs().map((r) => r.nativeElement);
    const panels = this.panels();
    if (!svgs.length) return null;
    const ns = 'http://www.w3.org/2000/svg';
    const out = document.createElementNS(ns, 'svg');
    out.setAttribute('xmlns', ns);
    out.setAttribute('width', String(W * svgs.length));
    out.setAttribute('height', String(H + TITLE_H));
    svgs.forEach((svg, i) => {
      const title = document.createElementNS(ns, 'text');
      title.setAttribute('x', String(i * W + 8));
      title.setAttribute('y', '16');
      title.setAttribute('font-size', '13');
      title.setAttribute('font-family', 'sans-serif');
      title.textContent = panels[i]?.title ?? '';
      out.appendChild(title);
      const clone = svg.cloneNode(true) as SVGSVGElement;
      clone.setAttribute('x', String(i * W));
      clone.setAttribute('y', String(TITLE_H));
      clone.setAttribute('width', String(W));
      clone.setAttribute('height', String(H));
      out.appendChild(clone);
    });
    return new XMLSerializer().serializeToString(out);
  }

  private renderAll(svgs: SVGSVGElement[], panels: DiagramPanel[], pal: Palette): void {
    this.zoomed.set(panels.map(() => false));
    this.current.set(panels.map(() => null));
    this.markIndex.length = 0;
    this.states = panels.map((p, i) => this.render(i, svgs[i]!, p.data, pal));
  }

  private render(i: number, svgEl: SVGSVGElement, data: DiagramData, pal: Palette): PanelState {
    const svg = select(svgEl);
    svg.on('.zoom', null);
    svg.selectAll('*').remove();
    svg.append('rect').attr('width', W).attr('height', H).attr('fill', pal.bg);
    const clipId = `clip-${Math.random().toString(36).slice(2, 8)}`;
    svg
      .append('defs')
      .append('clipPath')
      .attr('id', clipId)
      .append('rect')
      .attr('x', M.left)
      .attr('y', M.top)
      .attr('width', W - M.left - M.right)
      .attr('height', H - M.top - M.bottom);

    const [x0, y0] = baseScales(data);
    const gridG = svg.append('g').attr('data-role', 'grid');
    const plot = svg.append('g').attr('clip-path', `url(#${clipId})`).attr('data-role', 'plot');
    const xAxisG = svg.append('g').attr('transform', `translate(0,${H - M.bottom})`).attr('data-role', 'x-axis');
    const yAxisG = svg.append('g').attr('transform', `translate(${M.left},0)`).attr('data-role', 'y-axis');
    svg.append('text').attr('x', W - M.right).attr('y', H - 4).attr('text-anchor', 'end').attr('font-size', 11).attr('fill', pal.axis).text('Re');
    svg.append('text').attr('x', 6).attr('y', M.top + 8).attr('font-size', 11).attr('fill', pal.axis).text('Im');

    const state: PanelState = { zoom: null as never, marks: [] };
    const draw = (x: ScaleLinear<number, number>, y: ScaleLinear<number, number>) => {
      xAxisG.call(axisBottom(x).ticks(6)).call((g) => styleAxis(g, pal));
      yAxisG.call(axisLeft(y).ticks(6)).call((g) => styleAxis(g, pal));
      gridG.selectAll('*').remove();
      for (const t of x.ticks(6)) gridG.append('line').attr('x1', x(t)).attr('x2', x(t)).attr('y1', M.top).attr('y2', H - M.bottom).attr('stroke', pal.grid);
      for (const t of y.ticks(6)) gridG.append('line').attr('y1', y(t)).attr('y2', y(t)).attr('x1', M.left).attr('x2', W - M.right).attr('stroke', pal.grid);
      // The axes of the plane through 0.
      gridG.append('line').attr('x1', x(0)).attr('x2', x(0)).attr('y1', M.top).attr('y2', H - M.bottom).attr('stroke', pal.axis).attr('stroke-width', 0.8);
      gridG.append('line').attr('y1', y(0)).attr('y2', y(0)).attr('x1', M.left).attr('x2', W - M.right).attr('stroke', pal.axis).attr('stroke-width', 0.8);
      state.marks = this.drawPlot(i, plot, data, x, y, pal);
      svg.selectAll('[data-role="focus-ring"]').remove();
    };

    const zb = zoom<SVGSVGElement, unknown>()
      .scaleExtent([0.2, 40])
      .extent([
        [M.left, M.top],
        [W - M.right, H - M.bottom],
      ])
      .on('zoom', (event: { transform: typeof zoomIdentity }) => {
        const t = event.transform;
        this.zoomed.update((z) => {
          const out = [...z];
          out[i] = t.k !== 1 || t.x !== 0 || t.y !== 0;
          return out;
        });
        draw(t.rescaleX(x0), t.rescaleY(y0));
      });
    state.zoom = zb;
    svg.call(zb).on('dblclick.zoom', null);
    draw(x0, y0);
    return state;
  }

  /** Draws one plane's marks; answers the marks the keyboard can step to. */
  private drawPlot(
    i: number,
    plot: ReturnType<typeof select<SVGGElement, unknown>>,
    data: DiagramData,
    x: ScaleLinear<number, number>,
    y: ScaleLinear<number, number>,
    pal: Palette,
  ): Mark[] {
    plot.selectAll('*').remove();
    const marks: Mark[] = [];
    const [xmin, xmax] = x.domain();
    const [ymin, ymax] = y.domain();
    const far = 4 * Math.max(Math.abs(xmin), Math.abs(xmax), Math.abs(ymin), Math.abs(ymax), 1);
    const clampPt = (p: ComplexValue): ComplexValue => ({
      re: Number.isFinite(p.re) ? p.re : Math.sign(p.re) * far,
      im: Number.isFinite(p.im) ? p.im : Math.sign(p.im) * far,
    });
    const path = d3line<ComplexValue>()
      .x((p) => x(clampPt(p).re))
      .y((p) => y(clampPt(p).im));
    const tip = (sel: ReturnType<typeof select<SVGElement, unknown>>, text: string) => {
      sel.append('title').text(text);
      sel
        .on('mouseenter', (ev: MouseEvent) => this.showTip(i, ev, text))
        .on('mousemove', (ev: MouseEvent) => this.showTip(i, ev, text))
        .on('mouseleave', () => this.hideTip(i));
    };

    for (const s of data.sectors) {
      const r = far;
      const pts: ComplexValue[] = [{ re: 0, im: 0 }];
      const n = 40;
      for (let k = 0; k <= n; k++) {
        const t = s.from + ((s.to - s.from) * k) / n;
        pts.push({ re: r * Math.cos(t), im: r * Math.sin(t) });
      }
      // The mirror half: x -> e^(i theta) x rotates the whole line, so both rays sweep.
      const mirror: ComplexValue[] = [{ re: 0, im: 0 }, ...pts.slice(1).map((p) => ({ re: -p.re, im: -p.im }))];
      for (const poly of [pts, mirror]) {
        plot.append('path').attr('data-role', 'sector').attr('d', path(poly)! + 'Z').attr('fill', s.allowed ? pal.sector : pal.sectorBad).attr('stroke', 'none');
      }
      const mid = (s.from + s.to) / 2;
      marks.push({ x: x(Math.cos(mid)), y: y(Math.sin(mid)), text: `${s.label}: angles ${s.from.toFixed(3)} to ${s.to.toFixed(3)} rad, ${s.allowed ? 'allowed' : 'not allowed'}` });
    }
    for (const c of data.contours) {
      const extended = c.role === 'real' && c.points.length === 2 ? extendLine(c.points, far) : c.points;
      const el = plot
        .append('path')
        .attr('data-role', 'contour')
        .attr('d', path(extended))
        .attr('fill', 'none')
        .attr('stroke', c.role === 'real' ? pal.contour : pal.rotated)
        .attr('stroke-width', 2.5)
        .attr('stroke-dasharray', c.role === 'steepest' ? '2 3' : null);
      tip(el as never, c.label);
    }
    for (const c of data.cuts) {
      const el = plot.append('path').attr('data-role', 'cut').attr('d', path(c.points)).attr('fill', 'none').attr('stroke', pal.cut).attr('stroke-width', 3).attr('stroke-dasharray', '7 4');
      tip(el as never, c.label);
    }
    for (const t of data.tracks) {
      const det = t.of === 'det';
      const el = plot
        .append('path')
        .attr('data-role', det ? 'det-track' : 'track')
        .attr('d', path(t.points))
        .attr('fill', 'none')
        .attr('stroke', det ? pal.det : pal.track)
        .attr('stroke-width', det ? 2.2 : 1.6)
        .attr('stroke-dasharray', det ? '6 3' : null);
      tip(el as never, `${t.label}: from ${formatComplex(t.points[0] ?? { re: 0, im: 0 })} to ${formatComplex(t.points[t.points.length - 1] ?? { re: 0, im: 0 })}`);
      const end = t.points[t.points.length - 1];
      // An eigenvalue track ends at the eigenvalue drawn below; det A's end gets its own mark.
      if (end && (det || !data.eigenvalues.length)) {
        const g = plot.append('g').attr('data-role', det ? 'det-end' : 'track-end').attr('transform', `translate(${x(end.re)},${y(end.im)})`);
        g.append('rect').attr('x', -4).attr('y', -4).attr('width', 8).attr('height', 8).attr('fill', det ? pal.det : pal.track);
        if (det) g.append('text').attr('x', 8).attr('y', 12).attr('font-size', 11).attr('fill', pal.ink).text('det A');
        const text = `${t.label} ends at ${formatComplex(end)}`;
        tip(g as never, text);
        marks.push({ x: x(end.re), y: y(end.im), text });
      }
    }
    for (const p of data.paths) {
      plot.append('path').attr('data-role', 'continuation').attr('d', path(p.points)).attr('fill', 'none').attr('stroke', pal.path).attr('stroke-width', 2.5);
      const start = p.points[0];
      if (start) {
        const g = plot.append('circle').attr('data-role', 'path-start').attr('cx', x(start.re)).attr('cy', y(start.im)).attr('r', 4).attr('fill', pal.bg).attr('stroke', pal.path).attr('stroke-width', 2);
        const text = `Start of the path at ${p.parameter} = ${formatComplex(start)}`;
        tip(g as never, text);
        marks.push({ x: x(start.re), y: y(start.im), text });
      }
      // Events that fall together (a lost convergence and its rotated contour, the sheet and the end) are one mark.
      for (const group of cluster(p.events, (e) => [x(e.at.re), y(e.at.im)], 12)) {
        const numbers = [...new Set(group.items.map((e) => e.step).filter((n): n is number => n !== undefined))].sort((a, b) => a - b);
        const label = numbers.length ? numbers.join(',') : 'end';
        const text = group.items.map((e) => `${e.step ? `Step ${e.step}: ` : ''}${eventWord(e.kind)} at ${p.parameter} = ${formatComplex(e.at)}. ${e.text}`).join(' ');
        const g = plot.append('g').attr('data-role', 'event').attr('data-step', numbers.join(',') || null).attr('transform', `translate(${group.x},${group.y})`);
        if (numbers.length) {
          const w = Math.max(18, 7 * label.length + 8);
          g.append('rect').attr('x', -w / 2).attr('y', -9).attr('width', w).attr('height', 18).attr('rx', 9).attr('fill', pal.event).attr('stroke', pal.bg).attr('stroke-width', 1.5);
          g.append('text').attr('text-anchor', 'middle').attr('dy', '0.35em').attr('font-size', 10).attr('font-weight', 700).attr('fill', pal.bg).text(label);
        } else {
          g.append('rect').attr('x', -5).attr('y', -5).attr('width', 10).attr('height', 10).attr('fill', pal.bg).attr('stroke', pal.event).attr('stroke-width', 2);
          g.append('text').attr('x', 9).attr('y', 4).attr('font-size', 10).attr('fill', pal.ink).text('end');
        }
        tip(g as never, text);
        marks.push({ x: group.x, y: group.y, text });
      }
    }
    // Eigenvalues that fall together are one mark, labelled with their count.
    const eig = data.eigenvalues.map((ev, k) => ({ ev, k }));
    for (const group of cluster(eig, ({ ev }) => [x(ev.re), y(ev.im)], 10)) {
      const n = group.items.length;
      const g = plot.append('g').attr('data-role', 'eigenvalue').attr('data-count', n).attr('transform', `translate(${group.x},${group.y})`);
      g.append('path').attr('d', 'M0,-6L6,0L0,6L-6,0Z').attr('fill', pal.eigen).attr('stroke', pal.bg);
      const label = n > 1 ? `λ ×${n}` : `λ${sub(group.items[0]!.k + 1)}`;
      g.append('text').attr('x', 8).attr('y', -6).attr('font-size', 11).attr('fill', pal.ink).text(label);
      const at = data.eigenvaluesAt ? ` at ${data.eigenvaluesAt}` : '';
      const text = group.items.map(({ ev, k }) => `Eigenvalue λ${k + 1} = ${formatComplex(ev)}, argument ${ev.arg.toFixed(3)} rad`).join('; ') + at;
      tip(g as never, text);
      marks.push({ x: group.x, y: group.y, text });
    }
    return marks;
  }

  private showTip(i: number, ev: MouseEvent, text: string): void {
    const tip = this.tipRefs()[i]?.nativeElement;
    const host = tip?.parentElement;
    if (!tip || !host) return;
    const box = host.getBoundingClientRect();
    tip.textContent = text;
    tip.style.left = `${Math.min(ev.clientX - box.left + 12, box.width - 200)}px`;
    tip.style.top = `${ev.clientY - box.top + 12}px`;
    tip.hidden = false;
  }

  private hideTip(i: number): void {
    const tip = this.tipRefs()[i]?.nativeElement;
    if (tip) tip.hidden = true;
  }
}

/** The height of a panel's title in the exported SVG. */
const TITLE_H = 24;

function sub(n: number): string {
  return String(n).replace(/\d/g, (d) => '₀₁₂₃₄₅₆₇₈₉'[Number(d)]);
}

function extendLine([a, b]: ComplexValue[], far: number): ComplexValue[] {
  const dx = b.re - a.re;
  const dy = b.im - a.im;
  const len = Math.hypot(dx, dy) || 1;
  return [
    { re: (-dx / len) * far, im: (-dy / len) * far },
    { re: (dx / len) * far, im: (dy / len) * far },
  ];
}

/** Scales with equal units on both axes, covering every finite point and the origin. */
function baseScales(data: DiagramData): [ScaleLinear<number, number>, ScaleLinear<number, number>] {
  const pts: ComplexValue[] = [{ re: 0, im: 0 }];
  for (const c of data.contours) if (c.role !== 'real' || c.points.length > 2) pts.push(...c.points);
  for (const p of data.paths) pts.push(...p.points, ...p.events.map((e) => e.at));
  for (const t of data.tracks) pts.push(...t.points);
  pts.push(...data.eigenvalues);
  const finite = pts.filter((p) => Number.isFinite(p.re) && Number.isFinite(p.im));
  let [xmin, xmax] = [Math.min(...finite.map((p) => p.re)), Math.max(...finite.map((p) => p.re))];
  let [ymin, ymax] = [Math.min(...finite.map((p) => p.im)), Math.max(...finite.map((p) => p.im))];
  const span = Math.max(xmax - xmin, ymax - ymin, 1) * 1.25;
  const cx = (xmin + xmax) / 2;
  const cy = (ymin + ymax) / 2;
  const pw = W - M.left - M.right;
  const ph = H - M.top - M.bottom;
  const unit = Math.min(pw, ph) / span;
  xmin = cx - pw / unit / 2;
  xmax = cx + pw / unit / 2;
  ymin = cy - ph / unit / 2;
  ymax = cy + ph / unit / 2;
  return [
    scaleLinear().domain([xmin, xmax]).range([M.left, W - M.right]),
    scaleLinear().domain([ymin, ymax]).range([H - M.bottom, M.top]),
  ];
}

function styleAxis(g: ReturnType<typeof select<SVGGElement, unknown>>, pal: Palette): void {
  g.selectAll('path, line').attr('stroke', pal.axis);
  g.selectAll('text').attr('fill', pal.ink).attr('font-size', 10).attr('font-family', 'IBM Plex Mono, monospace');
}

export type LegendKey = 'contour' | 'rotated' | 'sector' | 'cut' | 'continuation' | 'event' | 'end' | 'track' | 'det' | 'eigenvalue';
export interface LegendItem {
  key: LegendKey;
  label: string;
}

function legendOf(data: DiagramData | null): LegendItem[] {
  if (!data) return [];
  const items: LegendItem[] = [];
  if (data.contours.some((c) => c.role === 'real')) items.push({ key: 'contour', label: 'Real contour' });
  if (data.contours.some((c) => c.role !== 'real')) items.push({ key: 'rotated', label: 'Rotated contour' });
  if (data.sectors.length) items.push({ key: 'sector', label: 'Swept sector' });
  if (data.cuts.length) items.push({ key: 'cut', label: data.cuts[0]!.label });
  if (data.paths.length) items.push({ key: 'continuation', label: 'Continuation path' });
  if (data.paths.some((p) => p.events.some((e) => e.step !== undefined))) items.push({ key: 'event', label: 'Event (number of its step)' });
  if (data.paths.some((p) => p.events.some((e) => e.step === undefined))) items.push({ key: 'end', label: 'End of the path' });
  if (data.tracks.some((t) => t.of !== 'det')) items.push({ key: 'track', label: 'Eigenvalue track' });
  if (data.tracks.some((t) => t.of === 'det')) items.push({ key: 'det', label: 'det A along the path' });
  if (data.eigenvalues.length) items.push({ key: 'eigenvalue', label: 'Eigenvalue of A' });
  return items;
}

function describe(data: DiagramData | null): DescriptionRow[] {
  if (!data) return [];
  const rows: DescriptionRow[] = [];
  for (const c of data.contours) rows.push({ what: c.label, where: c.role === 'real' && c.points.length === 2 ? 'the real axis' : pointsText(c.points) });
  for (const s of data.sectors) rows.push({ what: `${s.label} (${s.allowed ? 'allowed' : 'not allowed'})`, where: `angles ${s.from.toFixed(3)} to ${s.to.toFixed(3)} rad` });
  for (const c of data.cuts) rows.push({ what: c.label, where: c.points.some((p) => !Number.isFinite(p.re)) ? 'the negative real axis' : c.points.map((p) => formatComplex(p)).join(' → ') });
  for (const p of data.paths) {
    rows.push({ what: `${p.label} in ${p.parameter}`, where: pointsText(p.points) });
    p.events.forEach((e, i) => rows.push({ what: `Step ${e.step ?? i + 1}: ${eventWord(e.kind)}`, where: `${p.parameter} = ${formatComplex(e.at)}. ${e.text}` }));
  }
  for (const t of data.tracks) rows.push({ what: t.label, where: `from ${formatComplex(t.points[0] ?? { re: 0, im: 0 })} to ${formatComplex(t.points[t.points.length - 1] ?? { re: 0, im: 0 })}` });
  const at = data.eigenvaluesAt ? `, at ${data.eigenvaluesAt}` : '';
  data.eigenvalues.forEach((e, i) => rows.push({ what: `Eigenvalue λ${i + 1}`, where: `${formatComplex(e)}, argument ${e.arg.toFixed(3)} rad${at}` }));
  return rows;
}

/** A polyline in words: all its points when few, else its ends and how many points lie between. */
function pointsText(pts: readonly ComplexValue[]): string {
  if (pts.length <= 6) return pts.map((p) => formatComplex(p)).join(' → ');
  return `${formatComplex(pts[0]!)} → … → ${formatComplex(pts[pts.length - 1]!)} (${pts.length} points)`;
}

function download(blob: Blob, name: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}
