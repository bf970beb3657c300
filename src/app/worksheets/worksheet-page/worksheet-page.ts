import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, input, signal, untracked, viewChild } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Router, RouterLink } from '@angular/router';
import { catchError, distinctUntilChanged, filter, of, switchMap, tap } from 'rxjs';
import { LIMITS, type WorksheetDto } from '@shared/api';
import type { StatementReport } from '@shared/evaluation';
import { AuthStore } from '../../core/auth/auth-store';
import { Confirmer } from '../../core/dialogs/confirmer';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { AttachmentsPanel } from '../../files/attachments-panel/attachments-panel';
import { ExportMenu } from '../../files/export-menu/export-menu';
import { GroupsApi } from '../../groups/groups-api';
import { RefereeLinks } from '../../referee/referee-links/referee-links';
import { reviewForStatement } from '../../reviews/review-status';
import { ReviewThread } from '../../reviews/review-thread/review-thread';
import { placeBeside } from '../../reviews/review-thread/place-beside';
import { ComplexDiagram } from '../diagram/complex-diagram';
import { drawnStatement } from '../diagram/diagram-data';
import { CodeEditor } from '../editor/code-editor';
import { FindingCard, scrollCardIntoView } from '../findings/finding-card';
import { loadKatex } from '../findings/math';
import { checksOf, isProblem, kindWord, verdictView, verifyLineFor } from '../findings/finding-view';
import { ParamSummary } from '../findings/param-summary';
import { HasUnsavedChanges } from '../unsaved-changes-guard';
import { VersionHistory } from '../version-history/version-history';
import { WorksheetsApi } from '../worksheets-api';
import { openConflictDialog } from './conflict-dialog';
import { DraftStore } from './draft-store';
import { EvaluationController } from './evaluation-controller';
import { editorProblems, resultTexts } from './report-views';
import { saveStatus } from './save-status';
import { WorksheetReviews } from './worksheet-reviews';

type Sheet = 'help' | 'history' | 'review' | 'files' | 'referee';

export const SHORTCUTS: { keys: string; what: string }[] = [
  { keys: 'Ctrl+S', what: 'Save now (the worksheet also saves itself a moment after you stop typing)' },
  { keys: 'Ctrl+Enter', what: 'Evaluate now, without waiting for the pause' },
  { keys: 'F8', what: 'Go to the next problem: an error or a failed expectation' },
  { keys: 'F1', what: 'Show these keys' },
  { keys: 'Ctrl+Space', what: 'Complete a keyword, parameter, variable or result name (Tab accepts; Enter always ends the line)' },
  { keys: 'Ctrl+/', what: 'Turn the line into a comment, or back' },
  { keys: 'Esc, then Tab', what: 'Leave the editor for the findings and the rest of the page (Esc, then Shift+Tab: back to the controls above)' },
  { keys: 'Esc', what: 'Close this sheet or the history' },
];

/** "12 statements: 7 results, 1 problem (line 12: Rotation GB, not allowed)." */
export function findingsSummary(statements: readonly StatementReport[]): string {
  if (!statements.length) return '';
  const results = statements.filter((s) => s.result).length;
  const problems = statements.filter(isProblem);
  const head = `Findings: ${statements.length} statement${statements.length === 1 ? '' : 's'}, ${results} result${results === 1 ? '' : 's'}`;
  if (!problems.length) return `${head}, no problems.`;
  const list = problems.slice(0, 3).map((s) => `line ${s.line}: ${kindWord(s.kind)}${s.name ? ` ${s.name}` : ''}, ${verdictView(s).label.toLowerCase()}`).join('; ');
  return `${head}, ${problems.length} problem${problems.length === 1 ? '' : 's'} (${list}${problems.length > 3 ? '; …' : ''}).`;
}

/**
 * One worksheet: the source in the editor, the findings of each statement beside it, and the
 * complex plane of the selected statement. The draft and its saving live in DraftStore, the
 * findings and their evaluation in EvaluationController; this page links them to the screen.
 */
@Component({
  selector: 'app-worksheet-page',
  imports: [
    DatePipe, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule, MatProgressBarModule,
    CodeEditor, FindingCard, ParamSummary, ComplexDiagram, ExportMenu, AttachmentsPanel, RefereeLinks, ReviewThread, VersionHistory,
  ],
  providers: [DraftStore, EvaluationController, WorksheetReviews],
  templateUrl: './worksheet-page.html',
  styleUrl: './worksheet-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(window:beforeunload)': 'onBeforeUnload($event)',
    '(window:keydown)': 'onKeydown($event)',
    '(document:visibilitychange)': 'onVisibility()',
  },
})
export class WorksheetPage implements HasUnsavedChanges {
  protected readonly store = inject(DraftStore);
  protected readonly evaluation = inject(EvaluationController);
  protected readonly reviews = inject(WorksheetReviews);
  private readonly api = inject(WorksheetsApi);
  private readonly groups = inject(GroupsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly confirmer = inject(Confirmer);
  private readonly dialog = inject(MatDialog);
  private readonly auth = inject(AuthStore);
  private readonly editor = viewChild(CodeEditor);
  private readonly cardList = viewChild<ElementRef<HTMLElement>>('cardList');
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  /** The route parameter :id. */
  readonly id = input.required<string>();
  /** The query parameter ?review=KEY (from the review queue): open that statement's thread. */
  readonly review = input<string | undefined>(undefined);

  protected readonly limits = LIMITS;
  protected readonly shortcuts = SHORTCUTS;
  protected readonly loading = signal(true);
  protected readonly loadError = signal<string | null>(null);
  protected readonly groupName = signal<string | null>(null);
  protected readonly selectedLine = signal<number | null>(null);
  /** Which side sheet is open, so its content is made only while it shows. */
  protected readonly open = signal<'files' | 'referee' | 'history' | null>(null);
  private reviewParamHandled = false;

  protected readonly status = computed(() => saveStatus(this.store));
  protected readonly currentUserId = computed(() => this.auth.user()?.id ?? null);
  protected readonly stale = computed(() => ![null, this.store.draft()].includes(this.evaluation.reportSource()));
  protected readonly statements = this.evaluation.statements;
  protected readonly problems = computed(() => editorProblems(this.statements()));
  protected readonly problemCount = computed(() => this.statements().filter(isProblem).length);
  protected readonly hovers = computed(() => resultTexts(this.statements()));
  /** Parameter lines that evaluated are summed up in one card; every other statement has its own. */
  protected readonly cardStatements = computed(() => this.statements().filter((s) => s.kind !== 'param' || s.status !== 'ok'));
  protected readonly paramStatements = computed(() => this.statements().filter((s) => s.kind === 'param' && s.status === 'ok'));
  /** Each result's verify statements, by line. */
  protected readonly cardChecks = computed(() => new Map(this.statements().map((s) => [s.line, checksOf(s, this.statements())])));
  /** The findings in a sentence, announced politely when an evaluation ends. */
  protected readonly summary = computed(() => (this.evaluation.evaluating() ? '' : findingsSummary(this.statements())));
  protected readonly selected = computed<StatementReport | null>(() => {
    const line = this.selectedLine();
    return this.statements().find((s) => (line === null ? s.kind === 'integral' : s.line === line)) ?? null;
  });
  /** Each card's review entry, by line (lines are trusted only while the findings are of the saved text). */
  protected readonly cardReviews = computed(() => {
    const linesMatch = this.evaluation.reportSource() !== null && this.evaluation.reportSource() === this.store.base()?.source;
    const reviews = this.reviews.statements();
    return new Map(this.statements().map((s) => [s.line, reviewForStatement(s, reviews, linesMatch)]));
  });
  protected readonly threadReview = computed(() => {
    const line = this.reviews.threadLine();
    return line === null ? null : (this.cardReviews().get(line) ?? null);
  });
  protected readonly threadHeading = computed(() => {
    const line = this.reviews.threadLine();
    const st = line === null ? null : this.statements().find((s) => s.line === line);
    if (!st) return 'Review';
    return `${st.name ? `${kindWord(st.kind)} ${st.name}` : kindWord(st.kind)} · line ${st.line}`;
  });
  protected readonly drawn = computed(() => drawnStatement(this.selected(), this.statements()));

  constructor() {
    toObservable(computed(() => Number(this.id())))
      .pipe(
        tap((id) => {
          this.loading.set(true);
          this.loadError.set(null);
          // The stored report and KaTeX for its formulas are fetched while the worksheet is.
          if (Number.isInteger(id) && id > 0) (this.evaluation.prefetch(id), void loadKatex());
        }),
        switchMap((id) =>
          Number.isInteger(id) && id > 0
            ? this.api.get(id).pipe(catchError((err: unknown) => (this.loadError.set(apiErrorMessage(err)), of(null))))
            : (this.loadError.set('There is no worksheet at this address.'), of(null)),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((ws) => {
        this.loading.set(false);
        if (ws) this.openWorksheet(ws);
      });
    this.store.edits$.pipe(takeUntilDestroyed()).subscribe((text) => this.evaluation.edited(text));
    // Keep the shown report with the saved version on the server.
    this.store.saved$.pipe(takeUntilDestroyed()).subscribe((saved) => {
      if (this.evaluation.reportSource() === saved.source) this.evaluation.storeFor(saved.id);
    });
    // The reviews of the saved version: on opening, and again after each save.
    toObservable(computed(() => this.store.base()?.version ?? null))
      .pipe(distinctUntilChanged(), filter((v) => v !== null), switchMap(() => this.fetchReviews()), takeUntilDestroyed())
      .subscribe();
    effect(() => {
      const theirs = this.store.conflict();
      if (theirs) untracked(() => this.showConflict(theirs));
    });
  }

  hasUnsavedChanges(): boolean {
    // A draft that can still be saved is saved on leaving; only a blocked one needs a question.
    return this.store.blockedDraft();
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    if (!this.store.canEdit() || !this.store.dirty()) return;
    this.store.saveOnUnload();
    if (this.store.saveState() === 'conflict' || this.store.saveState() === 'error') event.preventDefault();
  }

  protected onVisibility(): void {
    if (document.visibilityState === 'hidden') this.store.keepDraftNow();
  }

  protected onKeydown(event: KeyboardEvent): void {
    if (event.defaultPrevented) return;
    const mod = event.ctrlKey || event.metaKey;
    const action =
      mod && event.key.toLowerCase() === 's' ? () => this.store.saveNow()
      : mod && event.key === 'Enter' ? () => this.evaluateNow()
      : event.key === 'F8' ? () => this.nextProblem()
      : event.key === 'F1' ? () => this.openSheet('help')
      : null;
    if (!action) return;
    event.preventDefault();
    action();
  }

  protected evaluateNow(): void {
    this.evaluation.evaluateNow(this.store.draft());
  }

  protected deleteWorksheet(): void {
    const base = this.store.base();
    if (!base) return;
    this.confirmer
      .ask({ title: 'Delete this worksheet?', message: `Delete the worksheet “${base.title}” and all its versions? This cannot be undone.`, confirm: 'Delete', danger: true })
      .pipe(filter(Boolean), switchMap(() => this.api.remove(base.id)))
      .subscribe({
        next: () => {
          this.store.forget(base.id);
          this.notifier.info(`Worksheet “${base.title}” deleted.`);
          void this.router.navigate(['/groups', base.groupId]);
        },
        error: (err: unknown) => this.notifier.error(err),
      });
  }

  // Findings and editor, linked both ways.

  protected selectCard(line: number): void {
    this.selectedLine.set(line);
    this.editor()?.revealLine(line);
  }

  protected onCursorLine(line: number): void {
    const at = [...this.statements()].reverse().find((s) => s.line <= line);
    if (!at || at.line === this.selectedLine()) return;
    this.selectedLine.set(at.line);
    queueMicrotask(() => scrollCardIntoView(this.cardList()?.nativeElement, at.line));
  }

  protected nextProblem(): void {
    const problems = this.statements().filter(isProblem);
    if (!problems.length) return this.notifier.info('No problems: every statement evaluated.');
    const here = this.editor()?.currentLine() ?? this.selectedLine() ?? 0;
    const next = problems.find((s) => (s.error?.line ?? s.line) > here) ?? problems[0];
    this.selectedLine.set(next.line);
    this.editor()?.revealLine(next.error?.line ?? next.line, next.error?.column ?? 1);
  }

  /** "Check numerically" on a card: a verify line for the result goes under it, and is evaluated. */
  protected checkNumerically(st: StatementReport): void {
    const editor = this.editor();
    if (!editor || !st.name || !this.store.canEdit()) return;
    const line = editor.insertLineAfter(st.line, verifyLineFor(st, this.evaluation.symbols()?.params ?? []));
    editor.revealLine(line, 1, false);
    this.selectedLine.set(line);
    this.evaluateNow();
  }

  // Side sheets: keys, review threads, files, referee links, history.

  protected openSheet(which: Sheet): void {
    if (which === 'files' || which === 'referee' || which === 'history') this.open.set(which);
    const d = this.sheet(which);
    if (d && !d.open) d.showModal?.();
  }

  private sheet(which: Sheet): HTMLDialogElement | null {
    return this.host.nativeElement.querySelector<HTMLDialogElement>(`dialog[data-sheet="${which}"]`);
  }

  protected closeDialog(d: HTMLDialogElement): void {
    d.close?.();
  }

  protected openThread(line: number): void {
    this.selectedLine.set(line);
    this.reviews.threadLine.set(line);
    this.openSheet('review');
    placeBeside(this.sheet('review'), this.cardList()?.nativeElement, line);
  }

  protected reloadReviews(): void {
    this.fetchReviews().subscribe();
  }

  protected restoreVersion(v: { source: string; number: number }): void {
    this.store.restore(v.source, v.number);
    this.sheet('history')?.close?.();
  }

  private openWorksheet(ws: WorksheetDto): void {
    this.store.open(ws);
    this.groups.get(ws.groupId).subscribe({ next: (g) => this.groupName.set(g.name), error: () => this.groupName.set(null) });
    // The saved text is in the editor: its stored report shows at once (a draft is evaluated live instead).
    if (this.store.draft() === ws.source) this.evaluation.open(ws.id, ws.source);
  }

  private fetchReviews() {
    const base = this.store.base();
    if (!base) return of(null);
    return this.reviews.load(base.id).pipe(tap(() => this.openReviewFromQuery()));
  }

  /** Coming from the review queue with ?review=KEY: open that thread once. */
  private openReviewFromQuery(): void {
    const key = this.review();
    const st = key && !this.reviewParamHandled ? this.reviews.statements().find((s) => s.key === key) : undefined;
    if (!st) return;
    this.reviewParamHandled = true;
    queueMicrotask(() => this.openThread(st.line));
  }

  private showConflict(theirs: WorksheetDto): void {
    openConflictDialog(this.dialog, { theirs, mine: this.store.merged() })?.subscribe((c) => {
      if (c?.choice === 'theirs') this.store.takeTheirs();
      else if (c?.choice === 'mine') this.store.keepMine();
      else if (c?.choice === 'merged') this.store.saveMerged(c.text);
    });
  }
}
