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
  viewChild,
} from '@angular/core';
import { axisBottom, axisLeft, line as d3line, scaleLinear, select, zoom, zoomIdentity, type ScaleLinear, type ZoomBehavior } from 'd3';
import type { DiagramData } from '@shared/diagram';
import type { ComplexValue } from '@shared/evaluation';
import { ThemeStore } from '../../core/theme/theme-store';
import { diagramFor, eventWord, formatComplex, type DiagramStatement } from './diagram-data';

const W = 560;
const H = 380;
const M = { top: 16, right: 16, bottom: 34, left: 46 };

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
  eigen: string;
}

const LIGHT: Palette = {
  bg: '#fffdf9', ink: '#0d2a36', grid: '#e7e2d6', axis: '#8a8577', contour: '#0b4f63', rotated: '#2b8a9e',
  cut: '#9c2f24', sector: 'rgba(11, 79, 99, 0.12)', sectorBad: 'rgba(156, 47, 36, 0.14)', path: '#b5651d',
  event: '#6b3a0f', track: '#5b4a8a', eigen: '#0d2a36',
};
const DARK: Palette = {
  bg: '#12232b', ink: '#e9e4d8', grid: '#22363f', axis: '#7f9097', contour: '#97cee6', rotated: '#5fc4d8',
  cut: '#ff8a7a', sector: 'rgba(151, 206, 230, 0.16)', sectorBad: 'rgba(255, 138, 122, 0.18)', path: '#e8a868',
  event: '#f6d2ac', track: '#c6b8ef', eigen: '#e9e4d8',
};

/** A row of the text alternative, one per drawn thing. */
interface DescriptionRow {
  what: string;
  where: string;
}

/**
 * The complex plane of one statement, drawn with d3: contours, swept sectors, the principal
 * cut, continuation paths with numbered events, eigenvalue tracks and eigenvalues; axes,
 * legend, zoom and pan, tooltips, a text alternative, and SVG or PNG export.
 */
@Component({
  selector: 'app-complex-diagram',
  templateUrl: './complex-diagram.html',
  styleUrl: './complex-diagram.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ComplexDiagram {
  private readonly theme = inject(ThemeStore);
  private readonly svgRef = viewChild<ElementRef<SVGSVGElement>>('svg');
  private readonly tipRef = viewChild<ElementRef<HTMLElement>>('tip');

  readonly statement = input<DiagramStatement | null>(null);

  protected readonly data = computed(() => diagramFor(this.statement()));
  protected readonly title = computed(() => {
    const st = this.statement();
    return st ? `Complex plane for line ${st.line}${st.name ? ` (${st.name})` : ''}` : 'Complex plane';
  });
  protected readonly legend = computed(() => legendOf(this.data()));
  protected readonly rows = computed(() => describe(this.data()));
  protected readonly zoomed = signal(false);

  private zoomBehavior: ZoomBehavior<SVGSVGElement, unknown> | null = null;

  constructor() {
    effect(() => {
      const data = this.data();
      const dark = this.theme.dark();
      const svg = this.svgRef()?.nativeElement;
      if (svg && data) untracked(() => this.render(svg, data, dark ? DARK : LIGHT));
    });
    inject(DestroyRef).onDestroy(() => {
      const svg = this.svgRef()?.nativeElement;
      if (svg) select(svg).on('.zoom', null);
    });
  }

  protected resetZoom(): void {
    const svg = this.svgRef()?.nativeElement;
    if (svg && this.zoomBehavior) select(svg).call(this.zoomBehavior.transform, zoomIdentity);
  }

  protected exportSvg(): void {
    const text = this.serialize();
    if (text) download(new Blob([text], { type: 'image/svg+xml' }), `${this.fileName()}.svg`);
  }

  protected exportPng(): void {
    const text = this.serialize();
    if (!text) return;
    const url = URL.createObjectURL(new Blob([text], { type: 'image/svg+xml' }));
    const img = new Image();
    img.onload = () => {
      const scale = 2;
      const canvas = document.createElement('canvas');
      canvas.width = W * scale;
      canvas.height = H * scale;
      const ctx = canvas.getContext('2d');
      if (!ctx) return;
      ctx.scale(scale, scale);
      ctx.drawImage(img, 0, 0, W, H);
      URL.revokeObjectURL(url);
      canvas.toBlob((blob) => blob && download(blob, `${this.fileName()}.png`), 'image/png');
    };
    img.src = url;
  }

  private fileName(): string {
    const st = this.statement();
    return `sheetwise-line-${st?.line ?? 0}${st?.name ? `-${st.name}` : ''}`;
  }

  private serialize(): string | null {
    const svg = this.svgRef()?.nativeElement;
    if (!svg) return null;
    const clone = svg.cloneNode(true) as SVGSVGElement;
    clone.setAttribute('xmlns', 'http://www.w3.org/2000/svg');
    clone.setAttribute('width', String(W));
    clone.setAttribute('height', String(H));
    return new XMLSerializer().serializeToString(clone);
  }

  private render(svgEl: SVGSVGElement, data: DiagramData, pal: Palette): void {
    const svg = select(svgEl);
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
    svg
      .append('text')
      .attr('x', W - M.right)
      .attr('y', H - 4)
      .attr('text-anchor', 'end')
      .attr('font-size', 11)
      .attr('fill', pal.axis)
      .text('Re');
    svg
      .append('text')
      .attr('x', 6)
      .attr('y', M.top + 4)
      .attr('font-size', 11)
      .attr('fill', pal.axis)
      .text('Im');
    const legendG = svg.append('g').attr('data-role', 'legend');

    const draw = (x: ScaleLinear<number, number>, y: ScaleLinear<number, number>) => {
      xAxisG.call(axisBottom(x).ticks(7)).call((g) => styleAxis(g, pal));
      yAxisG.call(axisLeft(y).ticks(6)).call((g) => styleAxis(g, pal));
      gridG.selectAll('*').remove();
      for (const t of x.ticks(7)) gridG.append('line').attr('x1', x(t)).attr('x2', x(t)).attr('y1', M.top).attr('y2', H - M.bottom).attr('stroke', pal.grid);
      for (const t of y.ticks(6)) gridG.append('line').attr('y1', y(t)).attr('y2', y(t)).attr('x1', M.left).attr('x2', W - M.right).attr('stroke', pal.grid);
      // The axes of the plane through 0.
      gridG.append('line').attr('x1', x(0)).attr('x2', x(0)).attr('y1', M.top).attr('y2', H - M.bottom).attr('stroke', pal.axis).attr('stroke-width', 0.8);
      gridG.append('line').attr('y1', y(0)).attr('y2', y(0)).attr('x1', M.left).attr('x2', W - M.right).attr('stroke', pal.axis).attr('stroke-width', 0.8);
      this.drawPlot(plot, data, x, y, pal);
    };

    const zb = zoom<SVGSVGElement, unknown>()
      .scaleExtent([0.2, 40])
      .extent([
        [M.left, M.top],
        [W - M.right, H - M.bottom],
      ])
      .on('zoom', (event: { transform: typeof zoomIdentity }) => {
        const t = event.transform;
        this.zoomed.set(t.k !== 1 || t.x !== 0 || t.y !== 0);
        draw(t.rescaleX(x0), t.rescaleY(y0));
      });
    this.zoomBehavior = zb;
    svg.call(zb).on('dblclick.zoom', null);
    this.zoomed.set(false);
    draw(x0, y0);
    drawLegend(legendG, legendOf(data), pal);
  }

  private drawPlot(
    plot: ReturnType<typeof select<SVGGElement, unknown>>,
    data: DiagramData,
    x: ScaleLinear<number, number>,
    y: ScaleLinear<number, number>,
    pal: Palette,
  ): void {
    plot.selectAll('*').remove();
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
        .on('mouseenter', (ev: MouseEvent) => this.showTip(ev, text))
        .on('mousemove', (ev: MouseEvent) => this.showTip(ev, text))
        .on('mouseleave', () => this.hideTip());
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
        plot
          .append('path')
          .attr('data-role', 'sector')
          .attr('d', path(poly)! + 'Z')
          .attr('fill', s.allowed ? pal.sector : pal.sectorBad)
          .attr('stroke', 'none');
      }
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
      plot
        .append('path')
        .attr('data-role', 'cut')
        .attr('d', path(c.points))
        .attr('fill', 'none')
        .attr('stroke', pal.cut)
        .attr('stroke-width', 3)
        .attr('stroke-dasharray', '7 4');
    }
    for (const t of data.tracks) {
      plot
        .append('path')
        .attr('data-role', 'track')
        .attr('d', path(t.points))
        .attr('fill', 'none')
        .attr('stroke', pal.track)
        .attr('stroke-width', 1.6);
      const end = t.points[t.points.length - 1];
      if (end) {
        const g = plot.append('circle').attr('data-role', 'track-end').attr('cx', x(end.re)).attr('cy', y(end.im)).attr('r', 3.5).attr('fill', pal.track);
        tip(g as never, `${t.label}: ends at ${formatComplex(end)}`);
      }
    }
    for (const p of data.paths) {
      plot
        .append('path')
        .attr('data-role', 'continuation')
        .attr('d', path(p.points))
        .attr('fill', 'none')
        .attr('stroke', pal.path)
        .attr('stroke-width', 2.5);
      const start = p.points[0];
      if (start) plot.append('circle').attr('cx', x(start.re)).attr('cy', y(start.im)).attr('r', 4).attr('fill', pal.bg).attr('stroke', pal.path).attr('stroke-width', 2);
      p.events.forEach((e, i) => {
        const n = e.step ?? i + 1;
        const g = plot.append('g').attr('data-role', 'event').attr('data-step', n).attr('transform', `translate(${x(e.at.re)},${y(e.at.im)})`);
        g.append('circle').attr('r', 9).attr('fill', pal.event).attr('stroke', pal.bg).attr('stroke-width', 1.5);
        g.append('text').attr('text-anchor', 'middle').attr('dy', '0.35em').attr('font-size', 10).attr('font-weight', 700).attr('fill', pal.bg).text(n);
        tip(g as never, `Step ${n}: ${eventWord(e.kind)} at ${p.parameter} = ${formatComplex(e.at)}. ${e.text}`);
      });
    }
    data.eigenvalues.forEach((ev, i) => {
      const g = plot.append('g').attr('data-role', 'eigenvalue').attr('transform', `translate(${x(ev.re)},${y(ev.im)})`);
      g.append('path').attr('d', 'M0,-6L6,0L0,6L-6,0Z').attr('fill', pal.eigen).attr('stroke', pal.bg);
      g.append('text').attr('x', 8).attr('y', -6).attr('font-size', 11).attr('fill', pal.ink).text(`λ${sub(i + 1)}`);
      tip(g as never, `Eigenvalue λ${i + 1} = ${formatComplex(ev)}, argument ${ev.arg.toFixed(3)} rad`);
    });
  }

  private showTip(ev: MouseEvent, text: string): void {
    const tip = this.tipRef()?.nativeElement;
    const host = tip?.parentElement;
    if (!tip || !host) return;
    const box = host.getBoundingClientRect();
    tip.textContent = text;
    tip.style.left = `${ev.clientX - box.left + 12}px`;
    tip.style.top = `${ev.clientY - box.top + 12}px`;
    tip.hidden = false;
  }

  private hideTip(): void {
    const tip = this.tipRef()?.nativeElement;
    if (tip) tip.hidden = true;
  }
}

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

type LegendKey = 'contour' | 'rotated' | 'sector' | 'cut' | 'continuation' | 'event' | 'track' | 'eigenvalue';
interface LegendItem {
  key: LegendKey;
  label: string;
}

function legendOf(data: DiagramData | null): LegendItem[] {
  if (!data) return [];
  const items: LegendItem[] = [];
  if (data.contours.some((c) => c.role === 'real')) items.push({ key: 'contour', label: 'Real contour' });
  if (data.contours.some((c) => c.role !== 'real')) items.push({ key: 'rotated', label: 'Rotated contour' });
  if (data.sectors.length) items.push({ key: 'sector', label: 'Swept sector' });
  if (data.cuts.length) items.push({ key: 'cut', label: data.cuts[0].label });
  if (data.paths.length) items.push({ key: 'continuation', label: 'Continuation path' });
  if (data.paths.some((p) => p.events.length)) items.push({ key: 'event', label: 'Event (step number)' });
  if (data.tracks.length) items.push({ key: 'track', label: 'Eigenvalue track' });
  if (data.eigenvalues.length) items.push({ key: 'eigenvalue', label: 'Eigenvalue of A' });
  return items;
}

function drawLegend(g: ReturnType<typeof select<SVGGElement, unknown>>, items: LegendItem[], pal: Palette): void {
  const colour: Record<LegendKey, string> = {
    contour: pal.contour, rotated: pal.rotated, sector: pal.sector, cut: pal.cut, continuation: pal.path,
    event: pal.event, track: pal.track, eigenvalue: pal.eigen,
  };
  const rowH = 16;
  const width = 150;
  const x0 = W - M.right - width - 6;
  const y0 = M.top + 6;
  g.append('rect').attr('x', x0).attr('y', y0).attr('width', width).attr('height', items.length * rowH + 8).attr('rx', 6).attr('fill', pal.bg).attr('opacity', 0.92).attr('stroke', pal.grid);
  items.forEach((it, i) => {
    const row = g.append('g').attr('data-role', 'legend-item').attr('transform', `translate(${x0 + 8},${y0 + 12 + i * rowH})`);
    if (it.key === 'sector') row.append('rect').attr('x', 0).attr('y', -5).attr('width', 18).attr('height', 10).attr('fill', colour.sector).attr('stroke', pal.contour).attr('stroke-width', 0.5);
    else if (it.key === 'event') row.append('circle').attr('cx', 9).attr('r', 5).attr('fill', colour.event);
    else if (it.key === 'eigenvalue') row.append('path').attr('d', 'M9,-5L14,0L9,5L4,0Z').attr('fill', colour.eigenvalue);
    else row.append('line').attr('x1', 0).attr('x2', 18).attr('stroke', colour[it.key]).attr('stroke-width', 2.5).attr('stroke-dasharray', it.key === 'cut' ? '5 3' : null);
    row.append('text').attr('x', 24).attr('dy', '0.35em').attr('font-size', 11).attr('fill', pal.ink).attr('font-family', 'Source Sans 3, sans-serif').text(it.label);
  });
}

function describe(data: DiagramData | null): DescriptionRow[] {
  if (!data) return [];
  const rows: DescriptionRow[] = [];
  for (const c of data.contours) rows.push({ what: c.label, where: c.role === 'real' && c.points.length === 2 ? 'the real axis' : c.points.map((p) => formatComplex(p)).join(' → ') });
  for (const s of data.sectors) rows.push({ what: `${s.label} (${s.allowed ? 'allowed' : 'not allowed'})`, where: `angles ${s.from.toFixed(3)} to ${s.to.toFixed(3)} rad` });
  for (const c of data.cuts) rows.push({ what: c.label, where: c.points.some((p) => !Number.isFinite(p.re)) ? 'the negative real axis' : c.points.map((p) => formatComplex(p)).join(' → ') });
  for (const p of data.paths) {
    rows.push({ what: `${p.label} in ${p.parameter}`, where: p.points.map((q) => formatComplex(q)).join(' → ') });
    p.events.forEach((e, i) => rows.push({ what: `Step ${e.step ?? i + 1}: ${eventWord(e.kind)}`, where: `${p.parameter} = ${formatComplex(e.at)}. ${e.text}` }));
  }
  for (const t of data.tracks) rows.push({ what: t.label, where: `from ${formatComplex(t.points[0] ?? { re: 0, im: 0 })} to ${formatComplex(t.points[t.points.length - 1] ?? { re: 0, im: 0 })}` });
  data.eigenvalues.forEach((e, i) => rows.push({ what: `Eigenvalue λ${i + 1}`, where: `${formatComplex(e)}, argument ${e.arg.toFixed(3)} rad` }));
  return rows;
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
