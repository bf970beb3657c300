import { Injectable, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import {
  EMPTY,
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
  shareReplay,
  switchMap,
  takeUntil,
  tap,
} from 'rxjs';
import type { EvaluationProgress, WorksheetReport } from '@shared/evaluation';
import { EvaluationApi, type EvaluationEvent, type StoredReport } from '../evaluation-api';

/**
 * Typing pause before a live evaluation. Short, because an evaluation after an edit is
 * cheap: the server computes only the statements whose text or inputs changed and keeps
 * the others' records (server/evaluation/reuse.ts), and a newer edit cancels it.
 */
export const EVALUATE_DELAY_MS = 150;

/** What to evaluate: a draft (live), or the saved version on opening (stored report first). */
type Job =
  | { kind: 'draft'; source: string; force: boolean }
  | { kind: 'open'; worksheetId: number; source: string };

/**
 * The findings shown beside the editor and how they are kept up to date, for one worksheet
 * page. Opening shows the stored report of the saved version at once and recomputes it in
 * the background only when it is missing or was made by another engine (marked
 * "Recomputing…"). Typing evaluates the draft after a pause; a newer request cancels the
 * older one (switchMap), which also cancels its work on the server.
 */
@Injectable()
export class EvaluationController {
  private readonly api = inject(EvaluationApi);

  readonly report = signal<WorksheetReport | null>(null);
  /** The source the shown report belongs to. */
  readonly reportSource = signal<string | null>(null);
  readonly evaluating = signal(false);
  /** The shown report is a stored one being recomputed (missing, or made by another engine). */
  readonly recomputing = signal(false);
  readonly progress = signal<EvaluationProgress | null>(null);
  readonly error = signal<string | null>(null);

  readonly statements = computed(() => this.report()?.statements ?? []);
  readonly symbols = computed(() => this.report()?.symbols ?? null);

  /** The stored report asked for as soon as the worksheet's id is known, alongside the worksheet itself. */
  private prefetched: { worksheetId: number; stored$: Observable<StoredReport | null> } | null = null;
  private readonly jobs$ = new Subject<Job>();
  private readonly edits$ = new Subject<string>();
  private readonly cancel$ = new Subject<void>();

  constructor() {
    const drafts$ = this.edits$.pipe(
      debounceTime(EVALUATE_DELAY_MS),
      map((source): Job => ({ kind: 'draft', source, force: false })),
    );
    merge(drafts$, this.jobs$)
      .pipe(
        distinctUntilChanged((a, b) => b.kind === 'draft' && !b.force && a.source === b.source),
        filter((j) => j.kind === 'open' || j.force || j.source !== this.reportSource()),
        switchMap((j) => (j.kind === 'open' ? this.openJob(j.worksheetId, j.source) : this.run(this.api.evaluateStream(j.source), j.source))),
        takeUntilDestroyed(),
      )
      .subscribe();
  }

  /** Ask for the stored report now, so it is there when the worksheet is (one round trip, not two). */
  prefetch(worksheetId: number): void {
    const stored$ = this.api.stored(worksheetId).pipe(
      catchError(() => of(null)),
      shareReplay(1),
    );
    stored$.subscribe();
    this.prefetched = { worksheetId, stored$ };
  }

  /** The saved version is in the editor: show its stored report, recomputing it only when needed. */
  open(worksheetId: number, source: string): void {
    this.jobs$.next({ kind: 'open', worksheetId, source });
  }

  /** The draft changed: evaluate it after a pause. */
  edited(source: string): void {
    this.edits$.next(source);
  }

  evaluateNow(source: string): void {
    this.jobs$.next({ kind: 'draft', source, force: true });
  }

  cancel(): void {
    this.cancel$.next();
  }

  /** A save made the shown report's text the latest version: have the server keep that report. */
  storeFor(worksheetId: number): void {
    this.api.recompute(worksheetId).pipe(catchError(() => EMPTY)).subscribe();
  }

  private openJob(worksheetId: number, source: string): Observable<unknown> {
    const prefetched = this.prefetched?.worksheetId === worksheetId ? this.prefetched.stored$ : null;
    this.prefetched = null;
    return (prefetched ?? this.api.stored(worksheetId).pipe(catchError(() => of(null)))).pipe(
      switchMap((stored: StoredReport | null) => {
        if (stored?.report && stored.current) {
          this.show(stored.report, source);
          return EMPTY;
        }
        if (!stored) return this.run(this.api.evaluateStream(source), source);
        // Show what there is at once; the fresh report replaces it when it comes.
        if (stored.report) this.show(stored.report, source);
        this.recomputing.set(true);
        return this.run(this.api.recompute(worksheetId), source).pipe(finalize(() => this.recomputing.set(false)));
      }),
    );
  }

  private run(events: Observable<EvaluationEvent>, source: string): Observable<unknown> {
    this.evaluating.set(true);
    this.progress.set(null);
    return events.pipe(
      tap((e) => {
        if (e.type === 'progress') this.progress.set({ index: e.index, line: e.line, total: e.total });
        else this.show(e.report, source);
      }),
      takeUntil(this.cancel$),
      catchError((err: unknown) => {
        this.error.set(err instanceof Error ? err.message : 'The evaluation failed.');
        return EMPTY;
      }),
      finalize(() => {
        this.evaluating.set(false);
        this.progress.set(null);
      }),
    );
  }

  private show(report: WorksheetReport, source: string): void {
    this.report.set(report);
    this.reportSource.set(source);
    this.error.set(null);
  }
}
