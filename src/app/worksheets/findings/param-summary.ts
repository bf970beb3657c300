import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import type { StatementReport, StepOf } from '@shared/evaluation';
import { renderStep } from '@shared/record/render';
import { nameLatex } from './finding-view';
import { MathDirective } from './math';

/** One declared name with its domain, as the renderer words and typesets it. */
export interface ParamEntry {
  line: number;
  names: string[];
  /** "k ∈ (0, ∞)" in LaTeX, the names upright when they have more than one letter. */
  latex: string;
  /** The renderer's sentence ("k is a positive real number."). */
  text: string;
}

/** The entries of the parameter lines that evaluated (a line with an error keeps its own card). */
export function paramEntries(statements: readonly StatementReport[]): ParamEntry[] {
  const out: ParamEntry[] = [];
  for (const st of statements) {
    if (st.kind !== 'param' || st.status !== 'ok') continue;
    const step = st.steps.find((s): s is StepOf<'param'> => s.kind === 'param');
    if (!step) continue;
    const { text, latex } = renderStep(step);
    // The renderer writes the names as they are, then "\in" and the domain: keep its domain, set the names as names.
    const domain = latex.slice(latex.indexOf('\\in'));
    out.push({ line: st.line, names: step.names, latex: `${step.names.map(nameLatex).join(', ')} ${domain}`, text });
  }
  return out;
}

/**
 * The declared parameters in one compact card: each line's names and domain in one row of
 * formulas. Pressing one puts the editor's cursor on its line.
 */
@Component({
  selector: 'app-param-summary',
  imports: [MathDirective],
  template: `
    <div class="head">
      <span class="material-symbols-outlined" aria-hidden="true">tune</span>
      <h3 class="title">Parameters</h3>
      <span class="count">{{ entries().length }} line{{ entries().length === 1 ? '' : 's' }}</span>
    </div>
    <ul class="entries">
      @for (e of entries(); track e.line) {
        <li>
          <button
            type="button"
            class="entry"
            data-testid="param-entry"
            [attr.data-line]="e.line"
            [attr.aria-pressed]="e.line === selectedLine()"
            [attr.title]="'Line ' + e.line + ': ' + e.text"
            (click)="select.emit(e.line)"
          >
            <span class="math" aria-hidden="true" [appMath]="e.latex"></span>
            <span class="sw-visually-hidden">Line {{ e.line }}: {{ e.text }}</span>
          </button>
        </li>
      }
    </ul>
  `,
  styles: `
    :host {
      display: block;
      background: var(--sw-surface);
      border: 1px solid var(--sw-rule);
      border-radius: 8px;
      padding: 0.4rem 0.8rem 0.5rem;
    }
    .head { display: flex; align-items: center; gap: 0.4rem; }
    .head .material-symbols-outlined { font-size: 18px; color: var(--sw-muted-ink); }
    .title { margin: 0; font-size: 0.95rem; font-weight: 600; flex: 1; }
    .count { font-size: 0.8rem; color: var(--sw-muted-ink); }
    .entries { display: flex; flex-wrap: wrap; gap: 0.25rem 0.5rem; list-style: none; margin: 0.25rem 0 0; padding: 0; }
    .entry {
      border: 1px solid transparent;
      border-radius: 6px;
      background: none;
      padding: 0.1rem 0.4rem;
      font: inherit;
      color: var(--sw-ink);
      cursor: pointer;
    }
    .entry:hover { border-color: var(--sw-rule); }
    .entry[aria-pressed='true'] { border-color: var(--mat-sys-primary); }
    .entry:focus-visible { outline: 2px solid var(--mat-sys-primary); outline-offset: 1px; }
  `,
  host: { 'data-testid': 'param-summary', role: 'listitem' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ParamSummary {
  readonly statements = input.required<readonly StatementReport[]>();
  readonly selectedLine = input<number | null>(null);
  readonly select = output<number>();
  protected readonly entries = computed(() => paramEntries(this.statements()));
}
