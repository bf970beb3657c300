import { DatePipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  computed,
  inject,
  input,
  signal,
  viewChild,
} from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import {
  Observable,
  Subject,
  catchError,
  debounceTime,
  distinctUntilChanged,
  filter,
  finalize,
  map,
  merge,
  of,
  switchMap,
  takeUntil,
  tap,
} from 'rxjs';
import { LIMITS, roleCan, type WorksheetDto, type WorksheetVersionDto } from '@shared/api';
import type { StatementReviewDto } from '@shared/collaboration';
import type { StatementReport, WorksheetReport } from '@shared/evaluation';
import { AuthStore } from '../../core/auth/auth-store';
import { apiErrorMessage, versionConflict } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { AttachmentsPanel } from '../../files/attachments-panel/attachments-panel';
import { ExportMenu } from '../../files/export-menu/export-menu';
import { GroupsApi } from '../../groups/groups-api';
import { RefereeLinks } from '../../referee/referee-links/referee-links';
import { reviewForStatement } from '../../reviews/review-status';
import { ReviewThread } from '../../reviews/review-thread/review-thread';
import { ReviewsApi } from '../../reviews/reviews-api';
import { ComplexDiagram } from '../diagram/complex-diagram';
import { diagramFor } from '../diagram/diagram-data';
import { CodeEditor, type EditorProblem } from '../editor/code-editor';
import { ConflictDiff } from '../editor/conflict-diff';
import { EvaluationApi, EvaluationError, type EvaluationEvent } from '../evaluation-api';
import { FindingCard } from '../findings/finding-card';
import { isProblem, kindWord } from '../findings/finding-view';
import { HasUnsavedChanges } from '../unsaved-changes-guard';
import { WorksheetsApi } from '../worksheets-api';
import { clearDraft, readDraft, writeDraft } from './worksheet-drafts';

type SaveState = 'idle' | 'saving' | 'saved' | 'conflict' | 'error';

/** Typing pause before a live evaluation, and before an autosave. */
export const EVALUATE_DELAY_MS = 250;
export const AUTOSAVE_DELAY_MS = 1500;

interface EvalRequest {
  source: string;
  force: boolean;
}

export const SHORTCUTS: { keys: string; what: string }[] = [
  { keys: 'Ctrl+S', what: 'Save now (the worksheet also saves itself a moment after you stop typing)' },
  { keys: 'Ctrl+Enter', what: 'Evaluate now, without waiting for the pause' },
  { keys: 'F8', what: 'Go to the next problem: an error or a failed expectation' },
  { keys: 'F1', what: 'Show these keys' },
  { keys: 'Ctrl+Space', what: 'Complete a keyword, parameter, variable or result name' },
  { keys: 'Ctrl+/', what: 'Turn the line into a comment, or back' },
  { keys: 'Esc', what: 'Close this sheet or the history' },
];

/**
 * One worksheet: the source in the editor, the findings of each statement beside it, and the
 * complex plane of the selected statement. Typing re-evaluates after a pause and autosaves;
 * a save that lost the race shows both versions side by side.
 */
@Component({
  selector: 'app-worksheet-page',
  imports: [
    DatePipe,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatProgressBarModule,
    CodeEditor,
    ConflictDiff,
    FindingCard,
    ComplexDiagram,
    ExportMenu,
    AttachmentsPanel,
    RefereeLinks,
    ReviewThread,
  ],
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
  private readonly api = inject(WorksheetsApi);
  private readonly evaluation = inject(EvaluationApi);
  private readonly groups = inject(GroupsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly pageTitle = inject(Title);
  private readonly editor = viewChild(CodeEditor);
  private readonly helpDialog = viewChild<ElementRef<HTMLDialogElement>>('helpDialog');
  private readonly historyDialog = viewChild<ElementRef<HTMLDialogElement>>('historyDialog');
  private readonly cardList = viewChild<ElementRef<HTMLElement>>('cardList');
  private readonly reviewDialog = viewChild<ElementRef<HTMLDialogElement>>('reviewDialog');
  private readonly filesDialog = viewChild<ElementRef<HTMLDialogElement>>('filesDialog');
  private readonly refereeDialog = viewChild<ElementRef<HTMLDialogElement>>('refereeDialog');
  private readonly reviewsApi = inject(ReviewsApi);
  private readonly auth = inject(AuthStore);

  /** The route parameter :id. */
  readonly id = input.required<string>();
  private readonly worksheetId = computed(() => Number(this.id()));
  /** The query parameter ?review=KEY (from the review queue): open that statement's thread. */
  readonly review = input<string | undefined>(undefined);

  protected readonly limits = LIMITS;
  protected readonly shortcuts = SHORTCUTS;
  /** The version on the server that the draft is based on. */
  protected readonly base = signal<WorksheetDto | null>(null);
  protected readonly draft = signal('');
  protected readonly draftTitle = signal('');
  protected readonly loading = signal(true);
  protected readonly loadError = signal<string | null>(null);

  protected readonly saveState = signal<SaveState>('idle');
  protected readonly saveError = signal<string | null>(null);
  /** The version someone else saved meanwhile (after a 409). */
  protected readonly conflict = signal<WorksheetDto | null>(null);
  /** The right side of the conflict view: the user's text, merged by hand. */
  protected readonly merged = signal('');
  /** The user's own text, kept after "take theirs" so it can be brought back. */
  protected readonly setAside = signal<string | null>(null);
  protected readonly restoredDraft = signal(false);

  protected readonly groupName = signal<string | null>(null);
  protected readonly versions = signal<WorksheetVersionDto[]>([]);
  protected readonly versionsError = signal<string | null>(null);
  protected readonly openVersion = signal<WorksheetVersionDto | null>(null);

  protected readonly report = signal<WorksheetReport | null>(null);
  /** The source the shown report belongs to. */
  protected readonly reportSource = signal<string | null>(null);
  protected readonly evaluating = signal(false);
  protected readonly progress = signal<{ index: number; line: number; total: number } | null>(null);
  protected readonly evalError = signal<string | null>(null);
  protected readonly selectedLine = signal<number | null>(null);

  protected readonly canEdit = computed(() => roleCan(this.base()?.role, 'editWorksheets'));

  // Review: the statements of the saved version with their reviews; one thread open at a time.
  protected readonly statementReviews = signal<StatementReviewDto[]>([]);
  protected readonly reviewsError = signal<string | null>(null);
  protected readonly threadLine = signal<number | null>(null);
  protected readonly currentUserId = computed(() => this.auth.user()?.id ?? null);
  protected readonly filesOpen = signal(false);
  protected readonly refereeOpen = signal(false);
  private reviewParamHandled = false;
  protected readonly dirty = computed(() => {
    const base = this.base();
    return !!base && (this.draft() !== base.source || this.draftTitle().trim() !== base.title);
  });
  protected readonly tooLong = computed(() => this.draft().length > LIMITS.worksheetSourceLength);
  protected readonly stale = computed(() => this.reportSource() !== null && this.reportSource() !== this.draft());

  protected readonly statements = computed(() => this.report()?.statements ?? []);
  protected readonly problems = computed<EditorProblem[]>(() =>
    this.statements()
      .filter(isProblem)
      .map((s) => ({
        line: s.error?.line ?? s.line,
        column: s.error?.column ?? 1,
        message: s.error?.message ?? failedMessage(s),
        severity: s.status === 'error' ? 'error' : 'warning',
      })),
  );
  protected readonly problemCount = computed(() => this.statements().filter(isProblem).length);
  protected readonly hovers = computed(() => {
    const m = new Map<string, string>();
    for (const s of this.statements()) if (s.name && s.result && !m.has(s.name)) m.set(s.name, s.result.text);
    return m;
  });
  protected readonly selected = computed<StatementReport | null>(() => {
    const line = this.selectedLine();
    const list = this.statements();
    if (line === null) return list.find((s) => s.kind === 'integral') ?? null;
    return list.find((s) => s.line === line) ?? null;
  });

  /** Each card's review entry, by line (lines are trusted only while the findings are of the saved text). */
  protected readonly cardReviews = computed(() => {
    const linesMatch = this.reportSource() !== null && this.reportSource() === this.base()?.source;
    const reviews = this.statementReviews();
    return new Map(this.statements().map((s) => [s.line, reviewForStatement(s, reviews, linesMatch)]));
  });
  protected readonly threadStatement = computed(() => {
    const line = this.threadLine();
    return line === null ? null : (this.statements().find((s) => s.line === line) ?? null);
  });
  protected readonly threadReview = computed(() => {
    const line = this.threadLine();
    return line === null ? null : (this.cardReviews().get(line) ?? null);
  });
  protected readonly threadHeading = computed(() => {
    const st = this.threadStatement();
    if (!st) return 'Review';
    return `${st.name ? `${kindWord(st.kind)} ${st.name}` : kindWord(st.kind)} · line ${st.line}`;
  });

  /** The statement whose plane is drawn: the selected one, or the nearest drawable one before it. */
  protected readonly drawn = computed<StatementReport | null>(() => {
    const sel = this.selected();
    const list = this.statements();
    if (sel && diagramFor(sel)) return sel;
    const before = list.filter((s) => (sel ? s.line <= sel.line : true) && diagramFor(s));
    return before[before.length - 1] ?? list.find((s) => diagramFor(s)) ?? null;
  });

  protected readonly statusText = computed(() => {
    const base = this.base();
    if (!base) return '';
    if (!this.canEdit()) return `Read only · version ${base.version}`;
    switch (this.saveState()) {
      case 'saving':
        return 'Saving…';
      case 'conflict': {
        const other = this.conflict();
        return other
          ? `Not saved: ${other.updatedBy} saved version ${other.version} meanwhile`
          : 'Not saved: someone saved meanwhile';
      }
      case 'error':
        return `Not saved: ${this.saveError() ?? 'the server did not accept the save'}`;
      default:
        if (this.dirty()) return `Unsaved changes · based on version ${base.version}`;
        return this.saveState() === 'saved' ? `Saved · version ${base.version}` : `Version ${base.version}`;
    }
  });
  protected readonly statusIcon = computed(() => {
    if (!this.canEdit()) return 'visibility';
    switch (this.saveState()) {
      case 'saving':
        return 'sync';
      case 'conflict':
      case 'error':
        return 'cloud_off';
      default:
        return this.dirty() ? 'edit_note' : 'cloud_done';
    }
  });

  private readonly edits$ = new Subject<string>();
  private readonly evaluateNow$ = new Subject<string>();
  private readonly cancel$ = new Subject<void>();
  private autosaveTimer: ReturnType<typeof setTimeout> | null = null;
  private retryTimer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    const destroyRef = inject(DestroyRef);
    toObservable(this.worksheetId)
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.loadError.set(null);
        }),
        switchMap((id) =>
          Number.isInteger(id) && id > 0
            ? this.api.get(id).pipe(
                catchError((err: unknown) => {
                  this.loadError.set(apiErrorMessage(err));
                  return of(null);
                }),
              )
            : (this.loadError.set('There is no worksheet at this address.'), of(null)),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((ws) => {
        this.loading.set(false);
        if (!ws) return;
        this.open(ws);
      });

    // Live evaluation: after a pause in typing, or at once on request; a newer one cancels the older.
    merge(
      this.edits$.pipe(
        debounceTime(EVALUATE_DELAY_MS),
        map((source): EvalRequest => ({ source, force: false })),
      ),
      this.evaluateNow$.pipe(map((source): EvalRequest => ({ source, force: true }))),
    )
      .pipe(
        distinctUntilChanged((a, b) => !b.force && a.source === b.source),
        filter((r) => r.force || r.source !== this.reportSource()),
        switchMap((r) => this.runEvaluation(this.evaluation.evaluateStream(r.source), r.source)),
        takeUntilDestroyed(),
      )
      .subscribe();

    // The reviews of the saved version: on opening, and again after each save.
    toObservable(computed(() => {
      const b = this.base();
      return b ? `${b.id}:${b.version}` : null;
    }))
      .pipe(
        distinctUntilChanged(),
        filter((k): k is string => k !== null),
        switchMap(() => this.fetchReviews()),
        takeUntilDestroyed(),
      )
      .subscribe();

    destroyRef.onDestroy(() => {
      this.clearTimers();
      // Leaving the page: save what is not saved yet (the request outlives the page).
      if (this.canEdit() && this.dirty() && this.saveState() !== 'conflict' && this.saveState() !== 'saving') this.save();
    });
  }

  hasUnsavedChanges(): boolean {
    // A draft that can still be saved is saved on leaving; only a blocked one needs a question.
    return this.canEdit() && this.dirty() && (this.saveState() === 'conflict' || this.tooLong());
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    if (!this.canEdit() || !this.dirty()) return;
    this.saveWithKeepalive();
    if (this.saveState() === 'conflict' || this.saveState() === 'error') event.preventDefault();
  }

  protected onVisibility(): void {
    if (document.visibilityState === 'hidden' && this.canEdit() && this.dirty() && this.saveState() !== 'conflict') {
      this.save();
    }
  }

  protected onKeydown(event: KeyboardEvent): void {
    if (event.defaultPrevented) return;
    const mod = event.ctrlKey || event.metaKey;
    if (mod && event.key.toLowerCase() === 's') {
      event.preventDefault();
      this.saveNow();
    } else if (mod && event.key === 'Enter') {
      event.preventDefault();
      this.evaluateNow();
    } else if (event.key === 'F8') {
      event.preventDefault();
      this.nextProblem();
    } else if (event.key === 'F1') {
      event.preventDefault();
      this.openHelp();
    }
  }

  /** The editor's text changed. */
  protected onEdit(text: string): void {
    this.draft.set(text);
    this.afterEdit();
  }

  protected onTitleEdit(text: string): void {
    this.draftTitle.set(text);
    this.afterEdit();
  }

  private afterEdit(): void {
    const base = this.base();
    if (!base || !this.canEdit()) return;
    if (this.saveState() === 'saved' || this.saveState() === 'error') this.saveState.set('idle');
    if (this.dirty()) {
      writeDraft(base.id, { source: this.draft(), title: this.draftTitle(), baseVersion: base.version });
    } else {
      clearDraft(base.id);
    }
    this.edits$.next(this.draft());
    this.scheduleAutosave();
  }

  protected saveNow(): void {
    if (!this.canEdit()) return;
    if (this.saveState() === 'conflict') return;
    this.save();
  }

  protected evaluateNow(): void {
    this.evaluateNow$.next(this.draft());
  }

  protected cancelEvaluation(): void {
    this.cancel$.next();
  }

  /** Save the draft (or a given text) on top of the version it is based on, or on top of theirs. */
  save(onTopOf?: number, text?: string): void {
    const base = this.base();
    if (!base || !this.canEdit() || this.saveState() === 'saving') return;
    this.clearTimers();
    if (this.tooLong()) {
      this.saveState.set('error');
      this.saveError.set(`the source is longer than ${LIMITS.worksheetSourceLength.toLocaleString('en')} characters`);
      return;
    }
    const title = this.draftTitle().trim();
    if (!title) {
      this.saveState.set('error');
      this.saveError.set('enter a title');
      return;
    }
    const sentSource = text ?? this.draft();
    this.saveState.set('saving');
    this.saveError.set(null);
    this.api
      .save(base.id, {
        source: sentSource,
        baseVersion: onTopOf ?? base.version,
        ...(title !== base.title ? { title } : {}),
      })
      .subscribe({
        next: (saved) => {
          this.base.set(saved);
          if (text !== undefined) this.draft.set(text);
          if (this.draftTitle().trim() === title) this.draftTitle.set(saved.title);
          this.conflict.set(null);
          this.saveState.set('saved');
          this.pageTitle.setTitle(`${saved.title} · Sheetwise`);
          if (this.draft() === saved.source) clearDraft(saved.id);
          else {
            writeDraft(saved.id, { source: this.draft(), title: this.draftTitle(), baseVersion: saved.version });
            this.scheduleAutosave();
          }
          if (this.historyOpen()) this.loadVersions();
          // Keep the report with the saved version on the server.
          if (this.reportSource() === saved.source) this.storeEvaluation(saved);
        },
        error: (err: unknown) => {
          const conflict = versionConflict(err);
          if (conflict) {
            this.conflict.set(conflict.current);
            this.merged.set(sentSource);
            this.saveState.set('conflict');
          } else {
            this.saveError.set(
              err instanceof HttpErrorResponse && err.status === 0
                ? 'the server could not be reached; your text is kept in this browser and saving will be tried again'
                : apiErrorMessage(err),
            );
            this.saveState.set('error');
            if (err instanceof HttpErrorResponse && (err.status === 0 || err.status >= 500)) {
              this.retryTimer = setTimeout(() => this.save(), 10_000);
            }
          }
        },
      });
  }

  /** Conflict: save the user's own text as the next version after theirs. */
  protected keepMine(): void {
    const theirs = this.conflict();
    if (theirs) this.save(theirs.version, this.draft());
  }

  /** Conflict: save the text as merged by hand in the right side of the comparison. */
  protected saveMerged(): void {
    const theirs = this.conflict();
    if (theirs) this.save(theirs.version, this.merged());
  }

  /** Conflict: take their version into the editor; the user's text is set aside, not dropped. */
  protected takeTheirs(): void {
    const theirs = this.conflict();
    if (!theirs) return;
    this.setAside.set(this.draft());
    this.adopt(theirs);
    clearDraft(theirs.id);
    this.conflict.set(null);
    this.saveState.set('idle');
    this.edits$.next(theirs.source);
  }

  protected bringBackMine(): void {
    const mine = this.setAside();
    if (mine === null) return;
    this.setAside.set(null);
    this.onEdit(mine);
  }

  protected deleteWorksheet(): void {
    const base = this.base();
    if (!base) return;
    if (!window.confirm(`Delete the worksheet “${base.title}” and all its versions? This cannot be undone.`)) return;
    this.api.remove(base.id).subscribe({
      next: () => {
        clearDraft(base.id);
        this.base.set(null);
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
    // Scroll the card list only (not the page) so the highlighted card is in view.
    queueMicrotask(() => {
      const list = this.cardList()?.nativeElement;
      const el = list?.querySelector<HTMLElement>(`[data-testid="finding-card"][data-line="${at.line}"]`);
      if (!list || !el) return;
      const top = el.offsetTop - list.offsetTop;
      if (top < list.scrollTop) list.scrollTop = top;
      else if (top + el.offsetHeight > list.scrollTop + list.clientHeight) list.scrollTop = top + el.offsetHeight - list.clientHeight;
    });
  }

  protected nextProblem(): void {
    const problems = this.statements().filter(isProblem);
    if (!problems.length) {
      this.notifier.info('No problems: every statement evaluated.');
      return;
    }
    const here = this.editor()?.currentLine() ?? this.selectedLine() ?? 0;
    const next = problems.find((s) => (s.error?.line ?? s.line) > here) ?? problems[0];
    const line = next.error?.line ?? next.line;
    this.selectedLine.set(next.line);
    this.editor()?.revealLine(line, next.error?.column ?? 1);
  }

  // Review threads, files and referee links (side sheets).

  protected openThread(line: number): void {
    this.selectedLine.set(line);
    this.threadLine.set(line);
    const d = this.reviewDialog()?.nativeElement;
    if (d && !d.open) d.showModal?.();
  }

  protected reloadReviews(): void {
    this.fetchReviews().subscribe();
  }

  private fetchReviews(): Observable<unknown> {
    const base = this.base();
    if (!base) return of(null);
    return this.reviewsApi.forWorksheet(base.id).pipe(
      tap((r) => {
        this.statementReviews.set(r.statements);
        this.reviewsError.set(null);
        this.openReviewFromQuery(r.statements);
      }),
      catchError((err: unknown) => {
        this.reviewsError.set(apiErrorMessage(err));
        return of(null);
      }),
    );
  }

  /** Coming from the review queue with ?review=KEY: open that thread once. */
  private openReviewFromQuery(statements: StatementReviewDto[]): void {
    const key = this.review();
    if (!key || this.reviewParamHandled) return;
    const st = statements.find((s) => s.key === key);
    if (!st) return;
    this.reviewParamHandled = true;
    queueMicrotask(() => this.openThread(st.line));
  }

  protected openFiles(): void {
    this.filesOpen.set(true);
    const d = this.filesDialog()?.nativeElement;
    if (d && !d.open) d.showModal?.();
  }

  protected openReferee(): void {
    this.refereeOpen.set(true);
    const d = this.refereeDialog()?.nativeElement;
    if (d && !d.open) d.showModal?.();
  }

  // Sheets: keys and history.

  protected openHelp(): void {
    const d = this.helpDialog()?.nativeElement;
    if (d && !d.open) d.showModal?.();
  }

  protected closeDialog(d: HTMLDialogElement): void {
    d.close?.();
  }

  protected historyOpen(): boolean {
    return !!this.historyDialog()?.nativeElement.open;
  }

  protected openHistory(): void {
    const d = this.historyDialog()?.nativeElement;
    if (!d) return;
    this.openVersion.set(null);
    this.loadVersions();
    if (!d.open) d.showModal?.();
  }

  protected viewVersion(v: WorksheetVersionDto): void {
    this.openVersion.update((open) => (open?.number === v.number ? null : v));
  }

  /** Restore an old version as a new version on top of the current one. */
  protected restoreVersion(v: WorksheetVersionDto): void {
    const base = this.base();
    if (!base) return;
    if (this.dirty() && !window.confirm('Restoring replaces the text you have not saved yet. Restore anyway?')) return;
    this.draft.set(v.source);
    this.save(base.version, v.source);
    this.edits$.next(v.source);
    this.historyDialog()?.nativeElement.close?.();
  }

  // Internals.

  private open(ws: WorksheetDto): void {
    this.adopt(ws);
    this.conflict.set(null);
    this.saveState.set('idle');
    this.groups.get(ws.groupId).subscribe({
      next: (g) => this.groupName.set(g.name),
      error: () => this.groupName.set(null),
    });
    const local = this.canEdit() ? readDraft(ws.id) : null;
    if (local && local.source !== ws.source) {
      if (local.baseVersion === ws.version) {
        this.draft.set(local.source);
        if (local.title) this.draftTitle.set(local.title);
        this.restoredDraft.set(true);
        this.edits$.next(local.source);
        this.scheduleAutosave();
      } else {
        // Someone saved after the draft was made: show both, never overwrite.
        this.draft.set(local.source);
        this.merged.set(local.source);
        this.conflict.set(ws);
        this.saveState.set('conflict');
        this.base.set(ws);
        this.edits$.next(local.source);
      }
    } else if (local) {
      clearDraft(ws.id);
    }
    if (this.draft() === ws.source) this.loadStoredReport(ws);
  }

  /** The last results of the saved version at once; computed and stored when none are kept yet. */
  private loadStoredReport(ws: WorksheetDto): void {
    this.evaluating.set(true);
    this.evaluation
      .stored(ws.id)
      .pipe(
        catchError((err: unknown) =>
          err instanceof HttpErrorResponse && err.status === 404 ? this.evaluation.evaluateSaved(ws.id) : of(null),
        ),
        catchError(() => of(null)),
      )
      .subscribe((stored) => {
        this.evaluating.set(false);
        if (stored && stored.version === this.base()?.version && this.reportSource() === null) {
          this.report.set(stored.report);
          this.reportSource.set(ws.source);
          this.evalError.set(null);
        } else if (this.reportSource() === null) {
          // No stored report to be had: evaluate the text live.
          this.evaluateNow$.next(this.draft());
        }
      });
  }

  private storeEvaluation(ws: WorksheetDto): void {
    this.evaluation.evaluateSaved(ws.id).pipe(catchError(() => of(null))).subscribe();
  }

  private runEvaluation(events: Observable<EvaluationEvent>, source: string): Observable<unknown> {
    this.evaluating.set(true);
    this.progress.set(null);
    return events.pipe(
      tap((e) => {
        if (e.type === 'progress') this.progress.set({ index: e.index, line: e.line, total: e.total });
        else {
          this.report.set(e.report);
          this.reportSource.set(source);
          this.evalError.set(null);
        }
      }),
      takeUntil(this.cancel$),
      catchError((err: unknown) => {
        this.evalError.set(err instanceof EvaluationError ? err.message : apiErrorMessage(err));
        return of(null);
      }),
      finalize(() => {
        this.evaluating.set(false);
        this.progress.set(null);
      }),
    );
  }

  private scheduleAutosave(): void {
    if (this.autosaveTimer) clearTimeout(this.autosaveTimer);
    this.autosaveTimer = setTimeout(() => {
      this.autosaveTimer = null;
      if (this.dirty() && this.saveState() !== 'conflict') {
        if (this.saveState() === 'saving') this.scheduleAutosave();
        else this.save();
      }
    }, AUTOSAVE_DELAY_MS);
  }

  private clearTimers(): void {
    if (this.autosaveTimer) clearTimeout(this.autosaveTimer);
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.autosaveTimer = this.retryTimer = null;
  }

  /** On unload HttpClient cannot finish a request; a keepalive fetch can. The draft stays in localStorage. */
  private saveWithKeepalive(): void {
    const base = this.base();
    if (!base || this.saveState() === 'conflict' || typeof fetch !== 'function') return;
    const token = /(?:^|; )XSRF-TOKEN=([^;]*)/.exec(document.cookie)?.[1];
    const title = this.draftTitle().trim();
    void fetch(`/api/worksheets/${base.id}`, {
      method: 'PUT',
      keepalive: true,
      credentials: 'same-origin',
      headers: { 'content-type': 'application/json', ...(token ? { 'x-xsrf-token': decodeURIComponent(token) } : {}) },
      body: JSON.stringify({ source: this.draft(), baseVersion: base.version, ...(title && title !== base.title ? { title } : {}) }),
    }).catch(() => undefined);
  }

  private adopt(ws: WorksheetDto): void {
    this.base.set(ws);
    this.draft.set(ws.source);
    this.draftTitle.set(ws.title);
    this.pageTitle.setTitle(`${ws.title} · Sheetwise`);
  }

  private loadVersions(): void {
    const base = this.base();
    if (!base) return;
    this.versionsError.set(null);
    this.api.versions(base.id).subscribe({
      next: (versions) => this.versions.set(versions),
      error: (err: unknown) => this.versionsError.set(apiErrorMessage(err)),
    });
  }
}

function failedMessage(s: StatementReport): string {
  const step = [...s.steps].reverse().find((x) => x.kind === 'expect' || x.kind === 'numeric-check');
  return step?.text ?? 'This statement failed.';
}
