import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, computed, inject, signal } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { CLAUSE_WORDS, CONSTANTS, COUNT_DOMAIN, DOMAIN_HELP, FUNCTIONS } from '@shared/language';
import type { StatementReport } from '@shared/evaluation';
import { EMPTY, catchError, concatMap, filter, from, map, take } from 'rxjs';
import { EvaluationApi } from '../worksheets/evaluation-api';
import { FindingCard } from '../worksheets/findings/finding-card';
import { loadKatex } from '../worksheets/findings/math';
import { WORKED_EXAMPLES, type WorkedExample } from './worked-examples';

type Output = { state: 'waiting' } | { state: 'done'; statement: StatementReport } | { state: 'failed'; message: string };

/**
 * /language: the worksheet language's reference, made from shared/language.ts (each
 * statement's form, help and example; the domains, functions and constants). Every
 * statement has a worked example, and its output is the server's own evaluation of that
 * example, made when the page opens (POST /api/evaluate, one example after another), so it
 * is always what this version of the computation answers and cannot go stale. Searchable
 * (?q= in the address); #keyword opens at that statement (the editor's hovers link there).
 */
@Component({
  selector: 'app-language-reference',
  imports: [MatFormFieldModule, MatInputModule, RouterLink, FindingCard],
  template: `
    <div class="sw-page">
      <nav class="crumbs" aria-label="Breadcrumb"><a routerLink="/groups">Groups</a> <span aria-hidden="true">/</span> <span aria-current="page">Language reference</span></nav>
      <p class="sw-eyebrow">Worksheet language</p>
      <h1>Language reference</h1>
      <p class="sw-muted">One statement per line. Each entry shows the form, what it does, and a worked example with the output this server computes for it now.</p>
      <mat-form-field appearance="outline" class="search" subscriptSizing="dynamic">
        <mat-label>Search statements, words, functions</mat-label>
        <input matInput type="search" [value]="query()" (input)="search($any($event.target).value)" data-testid="language-search" />
      </mat-form-field>
      <p class="sw-muted small" role="status" data-testid="language-count">{{ countText() }}</p>

      @for (e of shown(); track e.keyword) {
        <article class="entry sw-panel" [id]="e.keyword" [attr.data-keyword]="e.keyword" data-testid="language-entry">
          <h2><code>{{ e.keyword }}</code></h2>
          <p>@for (part of codeSpans(e.help); track $index) {@if (part.code) {<code>{{ part.text }}</code>} @else {{{ part.text }}}}</p>
          <p class="form"><span class="label">Form</span> <code>{{ e.form }}</code></p>
          <div class="example">
            <p class="label">Worked example</p>
            <pre class="source" tabindex="0" [attr.aria-label]="'Example of ' + e.keyword">@for (l of e.source.trimEnd().split('\\n'); track $index) {<span [class.focus]="$index + 1 === e.line">{{ l }}</span>
}</pre>
            <p class="label">Output</p>
            @let out = outputs()[e.keyword];
            @if (!out || out.state === 'waiting') {
              <p class="sw-muted small" role="status">Evaluating the example…</p>
            } @else if (out.state === 'failed') {
              <p class="sw-error small" role="alert">{{ out.message }}</p>
            } @else {
              <div class="card" data-testid="language-output"><app-finding-card [statement]="out.statement" [reviewable]="false" /></div>
            }
          </div>
        </article>
      } @empty {
        <p class="sw-muted">No statement matches “{{ query() }}”.</p>
      }

      @if (wordsShown()) {
        <section class="sw-panel entry" aria-labelledby="words-heading">
          <h2 id="words-heading">Words inside statements</h2>
          <dl class="words">
            @for (d of domains(); track d[0]) { <dt><code>{{ d[0] }}</code></dt><dd>domain: {{ d[1] }}</dd> }
            @for (f of functions(); track f[0]) { <dt><code>{{ f[0] }}(…)</code></dt><dd>{{ f[1] }}</dd> }
            @for (c of constants(); track c[0]) { <dt><code>{{ c[0] }}</code></dt><dd>{{ c[1] }}</dd> }
            <dt>clause words</dt><dd>@for (w of clauses; track w) { <code>{{ w }}</code>{{ $last ? '' : ', ' }} }</dd>
          </dl>
        </section>
      }
    </div>
  `,
  styles: `
    .crumbs { display: flex; gap: 0.5rem; font-size: 0.92rem; margin-bottom: 1rem; a { text-decoration: none; } }
    h1 { margin-top: 0; }
    .search { width: min(100%, 480px); }
    .small { font-size: 0.85rem; }
    .entry { margin: 0 0 1rem; scroll-margin-top: 5rem; }
    .entry h2 { margin: 0 0 0.3rem; font-size: 1.15rem; }
    .label { font-size: 0.78rem; font-weight: 600; text-transform: uppercase; letter-spacing: 0.04em; color: var(--sw-muted-ink); margin: 0.6rem 0 0.2rem; }
    .form code { overflow-wrap: anywhere; }
    .form .label { margin-right: 0.6rem; }
    .source { margin: 0; padding: 0.5rem 0.75rem; border: 1px solid var(--sw-rule); border-radius: 6px; font-size: 0.85rem; white-space: pre-wrap; overflow-wrap: anywhere; }
    .source .focus { font-weight: 700; }
    .words { display: grid; grid-template-columns: max-content 1fr; gap: 0.25rem 1rem; margin: 0; dd { margin: 0; } }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LanguageReference {
  private readonly evaluation = inject(EvaluationApi);
  private readonly router = inject(Router);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly route = inject(ActivatedRoute);

  protected readonly query = signal(this.route.snapshot.queryParamMap.get('q') ?? '');
  protected readonly outputs = signal<Partial<Record<string, Output>>>({});
  protected readonly clauses = CLAUSE_WORDS;
  /** The help texts mark code with backticks (Markdown, as the editor's hovers show them). */
  protected readonly codeSpans = (text: string) => text.split('`').map((t, i) => ({ text: t, code: i % 2 === 1 }));

  private readonly matches = (text: string) => text.toLowerCase().includes(this.query().trim().toLowerCase());
  protected readonly shown = computed(() =>
    WORKED_EXAMPLES.filter((e) => !this.query().trim() || [e.keyword, e.form, e.help, e.example].some((t) => this.matches(t))),
  );
  protected readonly domains = computed(() => [...Object.entries(DOMAIN_HELP), [COUNT_DOMAIN.label, COUNT_DOMAIN.help] as const].filter(([k, v]) => !this.query().trim() || this.matches(k) || this.matches(v)));
  protected readonly functions = computed(() => Object.entries(FUNCTIONS).filter(([k, v]) => !this.query().trim() || this.matches(k) || this.matches(v)));
  protected readonly constants = computed(() => Object.entries(CONSTANTS).filter(([k, v]) => !this.query().trim() || this.matches(k) || this.matches(v)));
  protected readonly wordsShown = computed(() => this.domains().length + this.functions().length + this.constants().length > 0 || !this.query().trim());
  protected readonly countText = computed(() => {
    const n = this.shown().length;
    return this.query().trim() ? `${n} of ${WORKED_EXAMPLES.length} statements match` : `${WORKED_EXAMPLES.length} statements`;
  });

  constructor() {
    void loadKatex();
    // One example after another, so the page never holds more than one of the account's evaluation slots.
    const sub = from(WORKED_EXAMPLES)
      .pipe(concatMap((e) => this.evaluate(e)))
      .subscribe();
    inject(DestroyRef).onDestroy(() => sub.unsubscribe());
    const fragment = this.route.snapshot.fragment;
    if (fragment) setTimeout(() => this.host.nativeElement.querySelector(`#${CSS.escape(fragment)}`)?.scrollIntoView({ block: 'start' }), 0);
  }

  protected search(text: string): void {
    this.query.set(text);
    void this.router.navigate([], { queryParams: { q: text || null }, replaceUrl: true, preserveFragment: false });
  }

  private evaluate(e: WorkedExample) {
    this.outputs.update((o) => ({ ...o, [e.keyword]: { state: 'waiting' } }));
    return this.evaluation.evaluateStream(e.source).pipe(
      filter((ev) => ev.type === 'report'),
      take(1),
      map((ev) => {
        const statement = ev.type === 'report' ? ev.report.statements.find((s) => s.line === e.line) : undefined;
        const out: Output = statement ? { state: 'done', statement } : { state: 'failed', message: 'The example gave no output.' };
        this.outputs.update((o) => ({ ...o, [e.keyword]: out }));
      }),
      // A failure is shown on its entry; the next example still runs.
      catchError((err: unknown) => {
        this.outputs.update((o) => ({ ...o, [e.keyword]: { state: 'failed', message: err instanceof Error ? err.message : 'The example could not be evaluated.' } }));
        return EMPTY;
      }),
    );
  }
}
