import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import type { WorksheetDto } from '@shared/api';
import { VERSION_NAME_LENGTH, type MilestoneCheckDto, type VersionDto, type VersionKind } from '@shared/versions-api';
import { Confirmer } from '../../core/dialogs/confirmer';
import { apiErrorMessage } from '../../core/http/api-error';
import { DraftStore } from '../worksheet-page/draft-store';
import { WorksheetsApi } from '../worksheets-api';
import { foldDiff, lineDiff } from './line-diff';

const KIND_WORDS: Record<VersionKind, string> = { created: 'first version', saved: 'saved', auto: 'automatic (after ten minutes of editing)', restored: 'restored' };

/**
 * The versions of a worksheet, newest first. Each is a checkpoint: an explicit save (with
 * an optional name), an automatic one (at most one per ten minutes of editing) or a
 * restore. Any two can be compared line by line; one opens to show its text, to be
 * restored as the next version, or to be signed off as a milestone when every result in
 * it is confirmed by a review.
 */
@Component({
  selector: 'app-version-history',
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatInputModule],
  template: `
    @if (error(); as text) {
      <p class="sw-error" role="alert">{{ text }}</p>
    }
    @let ws = worksheet();
    @if (canEdit() && store) {
      <div class="checkpoint" role="group" aria-label="Save a version" data-testid="checkpoint-form">
        <mat-form-field appearance="outline" subscriptSizing="dynamic">
          <mat-label>Name of the version (optional)</mat-label>
          <input matInput #name [attr.maxlength]="nameLength" data-testid="version-name" (keydown.enter)="$event.preventDefault(); checkpoint(name)" />
        </mat-form-field>
        <button mat-flat-button type="button" (click)="checkpoint(name)" [disabled]="!dirty() || store.saveState() === 'saving' || store.saveState() === 'conflict'" data-testid="make-version">
          <span class="material-symbols-outlined" aria-hidden="true">bookmark_add</span> Save as version {{ ws.version + 1 }}
        </button>
      </div>
      <p class="sw-muted small">Typing keeps a draft; a version is made when you save, or automatically after ten minutes of editing.</p>
    }

    @if (versions().length > 1) {
      <section class="compare" aria-labelledby="compare-heading">
        <h3 id="compare-heading">Compare two versions</h3>
        <div class="pick">
          <label>From
            <select [value]="from()" (change)="from.set(+$any($event.target).value)" data-testid="diff-from">
              @for (v of versions(); track v.number) { <option [value]="v.number" [selected]="v.number === from()">v{{ v.number }}{{ v.name ? ' · ' + v.name : '' }}</option> }
            </select>
          </label>
          <label>to
            <select [value]="to()" (change)="to.set(+$any($event.target).value)" data-testid="diff-to">
              @for (v of versions(); track v.number) { <option [value]="v.number" [selected]="v.number === to()">v{{ v.number }}{{ v.name ? ' · ' + v.name : '' }}</option> }
            </select>
          </label>
          <span class="sw-muted small" data-testid="diff-summary">{{ diffSummary() }}</span>
        </div>
        <div class="diff" role="table" aria-label="Lines removed and added" data-testid="version-diff" tabindex="0">
          @for (row of diff(); track $index) {
            @if (row.op === 'fold') {
              <div role="row" class="fold"><span role="cell">… {{ row.count }} unchanged line{{ row.count === 1 ? '' : 's' }}</span></div>
            } @else {
              <div role="row" [class]="row.op">
                <span role="cell" class="ln">{{ row.a ?? '' }}</span><span role="cell" class="ln">{{ row.b ?? '' }}</span>
                <span role="cell" class="mark" [attr.aria-label]="row.op === 'same' ? null : row.op">{{ row.op === 'added' ? '+' : row.op === 'removed' ? '−' : '' }}</span>
                <span role="cell" class="text">{{ row.text }}</span>
              </div>
            }
          } @empty {
            <p class="sw-muted">The two versions have the same text.</p>
          }
        </div>
      </section>
    }

    <ol class="versions" data-testid="version-list">
      @for (v of versions(); track v.number) {
        <li [class.current]="v.number === ws.version" [attr.data-version]="v.number">
          <button type="button" class="version-row" [attr.aria-expanded]="open()?.number === v.number" (click)="toggle(v)">
            <span class="num">v{{ v.number }}</span>
            <span class="what">
              @if (v.name) { <strong data-testid="version-name-shown">{{ v.name }}</strong> · }
              <span class="kind">{{ kindWord(v.kind) }}</span> · {{ v.authorName }}
              @if (v.milestone) {
                <span class="milestone" data-testid="milestone-badge"><span class="material-symbols-outlined" aria-hidden="true">flag</span> milestone</span>
              }
            </span>
            <time [attr.datetime]="v.createdAt">{{ v.createdAt | date: 'd MMM, HH:mm' }}</time>
          </button>
          @if (open()?.number === v.number) {
            <pre class="source-view" tabindex="0" [attr.aria-label]="'Version ' + v.number + ', read only'">{{ v.source }}</pre>
            @if (v.milestone; as m) {
              <p class="small">Signed off as a milestone by {{ m.by }}, <time [attr.datetime]="m.at">{{ m.at | date: 'd MMM y, HH:mm' }}</time>: every result in it was confirmed by a review.</p>
            } @else if (check(); as c) {
              <div class="check" data-testid="milestone-check">
                <p class="small">{{ c.ready ? 'Every result in this version is confirmed by a review.' : 'A milestone needs every result confirmed by a review:' }}</p>
                <ul class="small">
                  @for (r of c.results; track r.key) {
                    <li [class.ok]="r.status === 'confirmed'">{{ r.key }} (line {{ r.line }}): {{ r.status }}</li>
                  }
                </ul>
              </div>
            }
            <div class="row-actions">
              @if (canEdit() && v.number !== ws.version) {
                <button mat-stroked-button type="button" (click)="restoreVersion(v)" data-testid="restore-version">
                  <span class="material-symbols-outlined" aria-hidden="true">restore</span>
                  Restore as version {{ ws.version + 1 }}
                </button>
              }
              @if (canEdit() && !v.milestone) {
                <button mat-stroked-button type="button" [disabled]="!check()?.ready" (click)="signOff(v)" data-testid="sign-off">
                  <span class="material-symbols-outlined" aria-hidden="true">flag</span> Sign off as a milestone
                </button>
              }
            </div>
          }
        </li>
      } @empty {
        <li class="sw-muted">No versions listed yet.</li>
      }
    </ol>
  `,
  styleUrl: './version-history.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VersionHistory {
  private readonly api = inject(WorksheetsApi);
  private readonly confirmer = inject(Confirmer);
  /** The page's draft store, to save a named version (absent outside a worksheet page). */
  protected readonly store = inject(DraftStore, { optional: true });
  readonly worksheet = input.required<WorksheetDto>();
  readonly canEdit = input(false);
  /** Unsaved text would be replaced by a restore. */
  readonly dirty = input(false);
  readonly restore = output<{ source: string; number: number }>();

  protected readonly nameLength = VERSION_NAME_LENGTH;
  protected readonly versions = signal<VersionDto[]>([]);
  protected readonly error = signal<string | null>(null);
  protected readonly open = signal<VersionDto | null>(null);
  protected readonly check = signal<MilestoneCheckDto | null>(null);
  protected readonly from = signal(0);
  protected readonly to = signal(0);
  protected readonly kindWord = (k: VersionKind) => KIND_WORDS[k] ?? k;

  private readonly lines = computed(() => {
    const byNumber = new Map(this.versions().map((v) => [v.number, v.source]));
    const a = byNumber.get(this.from());
    const b = byNumber.get(this.to());
    return a === undefined || b === undefined ? [] : lineDiff(a, b);
  });
  protected readonly diff = computed(() => (this.lines().some((l) => l.op !== 'same') ? foldDiff(this.lines()) : []));
  protected readonly diffSummary = computed(() => {
    const added = this.lines().filter((l) => l.op === 'added').length;
    const removed = this.lines().filter((l) => l.op === 'removed').length;
    return `${added} line${added === 1 ? '' : 's'} added, ${removed} removed`;
  });

  constructor() {
    // Loaded when shown, and again after each new version.
    effect(() => {
      const { id } = this.worksheet();
      this.worksheet().version;
      untracked(() => this.load(id));
    });
  }

  protected checkpoint(field: HTMLInputElement): void {
    if (!this.dirty() || !this.store) return;
    this.store.saveNow(field.value);
    field.value = '';
  }

  protected toggle(v: VersionDto): void {
    const opening = this.open()?.number !== v.number;
    this.open.set(opening ? v : null);
    this.check.set(null);
    if (opening && !v.milestone) {
      this.api.milestoneCheck(this.worksheet().id, v.number).subscribe({ next: (c) => this.open()?.number === v.number && this.check.set(c), error: () => undefined });
    }
  }

  protected restoreVersion(v: VersionDto): void {
    if (!this.dirty()) return this.restore.emit({ source: v.source, number: v.number });
    this.confirmer
      .ask({
        title: 'Replace your unsaved text?',
        message: 'Restoring replaces the text you have not saved yet. Restore anyway?',
        confirm: 'Restore',
        danger: true,
      })
      .subscribe((ok) => ok && this.restore.emit({ source: v.source, number: v.number }));
  }

  protected signOff(v: VersionDto): void {
    this.confirmer
      .ask({ title: `Sign off version ${v.number}?`, message: `Mark version ${v.number} as a milestone: every result in it is confirmed by a review. This cannot be undone.`, confirm: 'Sign off' })
      .subscribe((ok) => {
        if (!ok) return;
        this.api.signOff(this.worksheet().id, v.number).subscribe({
          next: (signed) => {
            this.versions.update((all) => all.map((x) => (x.number === signed.number ? signed : x)));
            this.open.set(signed);
          },
          error: (err: unknown) => this.error.set(apiErrorMessage(err)),
        });
      });
  }

  private load(id: number): void {
    this.error.set(null);
    this.api.versions(id).subscribe({
      next: (versions) => {
        this.versions.set(versions);
        // By default: the previous version against the latest.
        this.to.set(versions[0]?.number ?? 0);
        this.from.set(versions[1]?.number ?? versions[0]?.number ?? 0);
      },
      error: (err: unknown) => this.error.set(apiErrorMessage(err)),
    });
  }
}
