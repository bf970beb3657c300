import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, input, output } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { Subject, of } from 'rxjs';
import type { GroupRole, WorksheetDto } from '@shared/api';
import { CodeEditor, type EditorProblem } from '../editor/code-editor';
import { ConflictDiff } from '../editor/conflict-diff';
import { EvaluationApi, type EvaluationEvent, type StoredReport } from '../evaluation-api';
import { FIXTURE_REPORT } from '../testing/report-fixture';
import { ConflictDialog } from './conflict-dialog';
import { DraftStore } from './draft-store';
import { WorksheetPage } from './worksheet-page';

/** Stands in for Monaco (the real editor is tested end to end in the browser). */
@Component({
  selector: 'app-code-editor',
  template: `<textarea data-testid="editor" [value]="value()" [readOnly]="readOnly()" (input)="valueChange.emit($any($event.target).value)"></textarea>`,
})
class EditorDouble {
  readonly value = input('');
  readonly readOnly = input(false);
  readonly problems = input<EditorProblem[]>([]);
  readonly hovers = input<Map<string, string>>(new Map());
  readonly symbols = input<unknown>(null);
  readonly valueChange = output<string>();
  readonly cursorLine = output<number>();
  readonly save = output<void>();
  readonly evaluateNow = output<void>();
  readonly nextProblem = output<void>();
  readonly help = output<void>();
  static last: EditorDouble | null = null;
  constructor() {
    EditorDouble.last = this;
  }
}

@Component({ selector: 'app-conflict-diff', template: `<div data-testid="conflict-diff">{{ theirs() }} | {{ mine() }}</div>` })
class DiffDouble {
  readonly theirs = input.required<string>();
  readonly mine = input.required<string>();
  readonly mineChange = output<string>();
}

const sheet = (over: Partial<WorksheetDto> = {}): WorksheetDto => ({
  id: 7,
  groupId: 5,
  title: 'Two coupled modes',
  version: 3,
  updatedAt: '2026-03-01T10:00:00Z',
  updatedBy: 'Noor Amsel',
  source: 'param k : positive\n',
  role: 'author',
  ...over,
});

describe('WorksheetPage', () => {
  let http: HttpTestingController;
  const evaluated: string[] = [];
  let recomputed: number;
  /** What GET /report answers, and the stream POST /report gives. */
  let stored: StoredReport;
  let recompute$: Subject<EvaluationEvent>;

  beforeEach(() => {
    localStorage.clear();
    evaluated.length = 0;
    recomputed = 0;
    stored = { version: 3, engine: 'test-engine', current: true, report: FIXTURE_REPORT };
    recompute$ = new Subject();
    document.querySelector('.cdk-overlay-container')?.replaceChildren();
    TestBed.configureTestingModule({
      imports: [WorksheetPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        {
          provide: EvaluationApi,
          useValue: {
            stored: () => of(stored),
            recompute: () => (recomputed++, recompute$),
            evaluateStream: (source: string) => {
              evaluated.push(source);
              return of({ type: 'report', report: FIXTURE_REPORT });
            },
          },
        },
      ],
    });
    TestBed.overrideComponent(WorksheetPage, { remove: { imports: [CodeEditor] }, add: { imports: [EditorDouble] } });
    TestBed.overrideComponent(ConflictDialog, { remove: { imports: [ConflictDiff] }, add: { imports: [DiffDouble] } });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    // The reviews of the saved version are fetched on opening and after each save.
    http.match((r) => r.url === '/api/worksheets/7/reviews');
    // the server-side draft (kept at pauses) and the light poll for a newer version
    http.match((r) => r.url === '/api/worksheets/7/draft' || r.url === '/api/worksheets/7/head');
    http.verify();
  });

  async function open(role: GroupRole, over: Partial<WorksheetDto> = {}) {
    const fixture = TestBed.createComponent(WorksheetPage);
    fixture.componentRef.setInput('id', '7');
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush({ worksheet: sheet({ role, ...over }) });
    await fixture.whenStable();
    http.expectOne('/api/groups/5').flush({
      group: { id: 5, name: 'Mode integrals', role, memberCount: 4, worksheetCount: 4 },
    });
    await fixture.whenStable();
    // no draft kept on the server for this person
    for (const r of http.match((q) => q.url === '/api/worksheets/7/draft' && q.method === 'GET')) r.flush({ draft: null });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  const overlay = (selector: string) => document.querySelector<HTMLElement>(`.cdk-overlay-container ${selector}`);
  const store = (fixture: ComponentFixture<WorksheetPage>) => fixture.debugElement.injector.get(DraftStore);
  /** A dialog reports its choice after it has closed. */
  async function settle(fixture: ComponentFixture<WorksheetPage>) {
    await new Promise((r) => setTimeout(r, 50));
    await fixture.whenStable();
  }
  const status = (el: HTMLElement) => el.querySelector('[data-testid="save-status"]')!.textContent!.trim();
  const editor = (el: HTMLElement) => el.querySelector<HTMLTextAreaElement>('[data-testid="editor"]')!;
  async function type(fixture: ComponentFixture<WorksheetPage>, text: string) {
    editor(fixture.nativeElement).value = text;
    editor(fixture.nativeElement).dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }

  for (const role of ['reader', 'reviewer'] as const) {
    it(`shows the source read-only to a ${role}, with no save control`, async () => {
      const { el } = await open(role);
      expect(editor(el).value).toBe('param k : positive\n');
      expect(editor(el).readOnly).toBe(true);
      expect(el.querySelector('[data-testid="save-worksheet"]')).toBeNull();
      expect(status(el)).toContain('Read only · version 3');
    });
  }

  it('shows the stored findings at once: a card per statement in source order, markers for problems', async () => {
    const { el } = await open('author');
    const cards = [...el.querySelectorAll('[data-testid="finding-card"]')];
    // The parameter line is summed up in one compact card above the others.
    expect([...el.querySelectorAll('[data-testid="param-summary"] [data-testid="param-entry"]')].map((e) => e.getAttribute('data-line'))).toEqual(['1']);
    expect(cards.map((c) => c.getAttribute('data-line'))).toEqual(['2', '3', '4']);
    expect(cards[2].querySelector('[data-testid="finding-error"]')).not.toBeNull();
    expect(cards[0].querySelector('[data-testid="finding-result"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="findings-summary"]')!.textContent).toContain('1 problem (line 4: Not understood, error)');
    expect(EditorDouble.last!.problems()).toEqual([
      { line: 4, column: 29, message: 'A closing parenthesis is missing before d(x).', severity: 'error' },
    ]);
    expect(EditorDouble.last!.hovers().get('Z3')).toContain('sqrt');
    expect(el.querySelector('[data-testid="evaluation-status"]')!.textContent).toContain('1 problem');
    expect(evaluated).toEqual([]);
    expect(recomputed).toBe(0);
    expect(el.querySelector('[data-testid="recomputing"]')).toBeNull();
    // Completion reads the names the parser declared, from the report.
    expect(EditorDouble.last!.symbols()).toEqual(FIXTURE_REPORT.symbols);
  });

  it('shows a stale stored report at once with a Recomputing mark, then the fresh one', async () => {
    const older = { ...FIXTURE_REPORT, statements: FIXTURE_REPORT.statements.slice(0, 2) };
    stored = { version: 3, engine: 'older-engine', current: false, report: older };
    const { fixture, el } = await open('author');
    expect(el.querySelectorAll('[data-testid="finding-card"]').length).toBe(1);
    expect(el.querySelector('[data-testid="recomputing"]')!.textContent).toContain('Recomputing');
    expect(el.querySelector('[data-testid="evaluation-status"]')!.textContent).not.toContain('Evaluating');
    expect(recomputed).toBe(1);
    recompute$.next({ type: 'progress', index: 1, line: 2, total: 4 });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="recomputing"]')!.textContent).toContain('statement 2 of 4');
    recompute$.next({ type: 'report', report: FIXTURE_REPORT });
    recompute$.complete();
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="recomputing"]')).toBeNull();
    expect(el.querySelectorAll('[data-testid="finding-card"]').length).toBe(3);
    expect(evaluated).toEqual([]);
  });

  it('recomputes in the background when no report is stored yet', async () => {
    stored = { version: 3, engine: '', current: false, report: null };
    const { fixture, el } = await open('author');
    expect(el.querySelector('[data-testid="recomputing"]')).not.toBeNull();
    recompute$.next({ type: 'report', report: FIXTURE_REPORT });
    recompute$.complete();
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="finding-card"]').length).toBe(3);
  });

  it('asks in a dialog before deleting the worksheet', async () => {
    const { fixture, el } = await open('owner');
    el.querySelector<HTMLButtonElement>('[data-testid="delete-worksheet"]')!.click();
    await fixture.whenStable();
    expect(overlay('[data-testid="confirm-message"]')!.textContent).toContain('Two coupled modes');
    overlay('[data-testid="confirm-cancel"]')!.click();
    await settle(fixture);
    http.expectNone('/api/worksheets/7');
  });

  it('links cards and lines: clicking a card selects it; moving the cursor highlights its card', async () => {
    const { fixture, el } = await open('author');
    // The first integral is selected at the start, and its plane drawn.
    expect(el.querySelector('[data-testid="finding-card"].selected')!.getAttribute('data-line')).toBe('2');
    // Three equal eigenvalues are one mark, labelled with their count.
    const eig = el.querySelectorAll('[data-testid="diagram"] [data-role="eigenvalue"]');
    expect([...eig].map((e) => e.getAttribute('data-count'))).toEqual(['3']);
    el.querySelector<HTMLButtonElement>('[data-testid="finding-card"][data-line="3"] button.goto')!.click();
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="finding-card"].selected')!.getAttribute('data-line')).toBe('3');
    expect(el.querySelectorAll('[data-testid="diagram"] [data-role="event"]').length).toBe(2);
    EditorDouble.last!.cursorLine.emit(4);
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="finding-card"].selected')!.getAttribute('data-line')).toBe('4');
  });

  it('keeps a local draft while unsaved, saves with the base version, then drops the draft', async () => {
    const { fixture, el } = await open('author');
    await type(fixture, 'param k : positive\nparam lam : real\n');
    expect(status(el)).toContain('Unsaved changes · based on version 3');
    expect(JSON.parse(localStorage.getItem('sheetwise.draft.7')!).source).toBe('param k : positive\nparam lam : real\n');
    el.querySelector<HTMLButtonElement>('[data-testid="save-worksheet"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/worksheets/7');
    expect(req.request.method).toBe('PUT');
    expect(req.request.body).toEqual({ source: 'param k : positive\nparam lam : real\n', baseVersion: 3 });
    req.flush({ worksheet: sheet({ version: 4, source: 'param k : positive\nparam lam : real\n' }) });
    await fixture.whenStable();
    expect(status(el)).toContain('Saved · version 4');
    expect(localStorage.getItem('sheetwise.draft.7')).toBeNull();
  });

  it('restores a local draft of the same base version after a reload', async () => {
    localStorage.setItem('sheetwise.draft.7', JSON.stringify({ source: 'typed before reload', title: 'Two coupled modes', baseVersion: 3 }));
    const { fixture, el } = await open('author');
    expect(editor(el).value).toBe('typed before reload');
    expect(el.querySelector('[data-testid="restored-draft"]')).not.toBeNull();
    store(fixture).save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush({ worksheet: sheet({ version: 4, source: 'typed before reload' }) });
    await fixture.whenStable();
  });

  it('on 409 shows both versions; keep mine saves on top of theirs', async () => {
    const { fixture, el } = await open('owner');
    await type(fixture, 'my text');
    store(fixture).save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      { error: { code: 'version_conflict', message: 'm' }, current: sheet({ version: 5, updatedBy: 'Ilse Varga', source: 'their text' }) },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    const panel = overlay('[data-testid="save-conflict"]')!;
    expect(panel.textContent).toContain('Ilse Varga');
    expect(overlay('[data-testid="conflict-diff"]')!.textContent).toContain('their text | my text');
    // The safe choice is the primary (filled) button; overwriting theirs is not.
    expect(overlay('[data-testid="take-theirs"]')!.getAttribute('mat-flat-button')).not.toBeNull();
    expect(overlay('[data-testid="keep-mine"]')!.getAttribute('mat-flat-button')).toBeNull();
    expect(status(el)).toContain('Not saved: Ilse Varga saved version 5 meanwhile');
    expect(fixture.componentInstance.hasUnsavedChanges()).toBe(true);

    overlay('[data-testid="keep-mine"]')!.click();
    await settle(fixture);
    const req = http.expectOne('/api/worksheets/7');
    expect(req.request.body).toEqual({ source: 'my text', baseVersion: 5 });
    req.flush({ worksheet: sheet({ version: 6, source: 'my text' }) });
    await fixture.whenStable();
    await fixture.whenStable();
    expect(overlay('[data-testid="save-conflict"]')).toBeNull();
    expect(status(el)).toContain('Saved · version 6');
  });

  it('on 409 take theirs loads their text and keeps mine to bring back', async () => {
    const { fixture, el } = await open('author');
    await type(fixture, 'my text');
    store(fixture).save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      { error: { code: 'version_conflict', message: 'm' }, current: sheet({ version: 5, source: 'their text' }) },
      { status: 409, statusText: 'Conflict' },
    );
    await fixture.whenStable();
    overlay('[data-testid="take-theirs"]')!.click();
    await settle(fixture);
    expect(editor(el).value).toBe('their text');
    expect(status(el)).toContain('Version 5');
    el.querySelector<HTMLButtonElement>('[data-testid="bring-back-mine"]')!.click();
    await fixture.whenStable();
    expect(editor(el).value).toBe('my text');
    expect(status(el)).toContain('Unsaved changes · based on version 5');
  });

  it('shows another save failure in plain words and keeps the text', async () => {
    const { fixture, el } = await open('author');
    await type(fixture, 'kept');
    store(fixture).save();
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7').flush(
      { error: { code: 'too_large', message: 'The worksheet is too large to save.' } },
      { status: 413, statusText: 'Payload Too Large' },
    );
    await fixture.whenStable();
    expect(status(el)).toContain('Not saved: The worksheet is too large to save.');
    expect(editor(el).value).toBe('kept');
  });

  it('lists the keys in a help sheet', async () => {
    const { el } = await open('author');
    const sheetEl = el.querySelector('[data-testid="help-sheet"]')!;
    const text = sheetEl.textContent!;
    for (const k of ['Ctrl+S', 'Ctrl+Enter', 'F8']) expect(text).toContain(k);
  });

  it('shows the review status of each card from the server and opens its thread', async () => {
    const { fixture, el } = await open('author');
    http.expectOne('/api/worksheets/7/reviews').flush({
      version: 3,
      statements: [
        { key: 'k', line: 1, text: 'param k : positive', status: 'unreviewed', reviews: [] },
        {
          key: 'Z3', line: 2, text: 'integral Z3 = …', status: 'confirmed',
          reviews: [{
            id: 11, worksheetId: 7, worksheetTitle: 'Two coupled modes', statementKey: 'Z3', statementText: 'integral Z3 = …', version: 3,
            status: 'confirmed', reviewer: 'Tobiah Osei', reviewerId: 3, requestedBy: 'Noor Amsel', requestedAt: '2026-03-01T10:00:00Z',
            decidedAt: '2026-03-01T11:00:00Z', stale: false, comments: [{ id: 1, author: 'Tobiah Osei', body: 'Checked the branch.', createdAt: '2026-03-01T11:00:00Z' }],
          }],
        },
      ],
    });
    await fixture.whenStable();
    const badge = el.querySelector<HTMLButtonElement>('[data-testid="finding-card"][data-line="2"] [data-testid="review-badge"]')!;
    expect(badge.dataset['status']).toBe('confirmed');
    expect(badge.textContent).toContain('Confirmed');
    badge.click();
    await fixture.whenStable();
    const sheet = el.querySelector('[data-testid="review-sheet"]')!;
    expect(sheet.textContent).toContain('Integral Z3 · line 2');
    expect(sheet.textContent).toContain('Checked the branch.');
    expect(sheet.querySelector('[data-testid="ask-review"]')).not.toBeNull();
  });

  it('offers export to everyone and referee links to authors only', async () => {
    const { el } = await open('reader');
    expect(el.querySelector('[data-testid="export-menu"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="open-files"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="open-referee"]')).toBeNull();
  });
});
