import { HttpErrorResponse } from '@angular/common/http';
import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { Title } from '@angular/platform-browser';
import { Subject } from 'rxjs';
import { LIMITS, roleCan, type WorksheetDto } from '@shared/api';
import { apiErrorMessage, versionConflict } from '../../core/http/api-error';
import { WorksheetsApi } from '../worksheets-api';
import { clearDraft, readDraft, writeDraft } from './worksheet-drafts';

export type SaveState = 'idle' | 'saving' | 'saved' | 'conflict' | 'error';

/** Typing pause before an autosave. */
export const AUTOSAVE_DELAY_MS = 1500;
const RETRY_MS = 10_000;

/**
 * The text being edited and its way to the server, for one worksheet page (provided by the
 * page, not the root): the draft and title, the version they are based on, the copy kept in
 * this browser, autosave after a pause, retry after a network failure, and the state of a
 * save that lost the race (a conflict is shown, never overwritten).
 */
@Injectable()
export class DraftStore {
  private readonly api = inject(WorksheetsApi);
  private readonly pageTitle = inject(Title);

  /** The version on the server that the draft is based on. */
  readonly base = signal<WorksheetDto | null>(null);
  readonly draft = signal('');
  readonly draftTitle = signal('');
  readonly saveState = signal<SaveState>('idle');
  readonly saveError = signal<string | null>(null);
  /** The version someone else saved meanwhile (after a 409). */
  readonly conflict = signal<WorksheetDto | null>(null);
  /** The user's side of the conflict: their text, merged by hand. */
  readonly merged = signal('');
  /** The user's own text, kept after "take theirs" so it can be brought back. */
  readonly setAside = signal<string | null>(null);
  readonly restoredDraft = signal(false);

  readonly canEdit = computed(() => roleCan(this.base()?.role, 'editWorksheets'));
  readonly dirty = computed(() => {
    const base = this.base();
    return !!base && (this.draft() !== base.source || this.draftTitle().trim() !== base.title);
  });
  readonly tooLong = computed(() => this.draft().length > LIMITS.worksheetSourceLength);

  /** Texts to evaluate: each edit, and the text a conflict or restore put in the editor. */
  readonly edits$ = new Subject<string>();
  /** Each version saved from this page. */
  readonly saved$ = new Subject<WorksheetDto>();

  private autosaveTimer: ReturnType<typeof setTimeout> | null = null;
  private retryTimer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    inject(DestroyRef).onDestroy(() => {
      this.clearTimers();
      // Leaving the page: save what is not saved yet (the request outlives the page).
      if (this.canSaveOnLeave() && this.saveState() !== 'saving') this.save();
    });
  }

  /** A worksheet arrived from the server: take it, or the browser's newer draft of it (or show both). */
  open(ws: WorksheetDto): void {
    this.adopt(ws);
    this.conflict.set(null);
    this.saveState.set('idle');
    const local = this.canEdit() ? readDraft(ws.id) : null;
    if (!local) return;
    if (local.source === ws.source) return clearDraft(ws.id);
    this.draft.set(local.source);
    if (local.baseVersion === ws.version) {
      if (local.title) this.draftTitle.set(local.title);
      this.restoredDraft.set(true);
      this.scheduleAutosave();
    } else {
      // Someone saved after the draft was made: show both, never overwrite.
      this.merged.set(local.source);
      this.conflict.set(ws);
      this.saveState.set('conflict');
    }
    this.edits$.next(local.source);
  }

  edit(text: string): void {
    this.draft.set(text);
    this.afterEdit();
  }

  editTitle(text: string): void {
    this.draftTitle.set(text);
    this.afterEdit();
  }

  /** Save now unless a conflict waits for a choice. */
  saveNow(): void {
    if (this.canEdit() && this.saveState() !== 'conflict') this.save();
  }

  /** Save the draft (or a given text) on top of the version it is based on, or on top of theirs. */
  save(onTopOf?: number, text?: string): void {
    const base = this.base();
    if (!base || !this.canEdit() || this.saveState() === 'saving') return;
    this.clearTimers();
    const title = this.draftTitle().trim();
    const blocked = this.tooLong()
      ? `the source is longer than ${LIMITS.worksheetSourceLength.toLocaleString('en')} characters`
      : !title
        ? 'enter a title'
        : null;
    if (blocked) {
      this.saveState.set('error');
      this.saveError.set(blocked);
      return;
    }
    const sentSource = text ?? this.draft();
    this.saveState.set('saving');
    this.saveError.set(null);
    this.api
      .save(base.id, { source: sentSource, baseVersion: onTopOf ?? base.version, ...(title !== base.title ? { title } : {}) })
      .subscribe({
        next: (saved) => this.onSaved(saved, title, text),
        error: (err: unknown) => this.onSaveFailed(err, sentSource),
      });
  }

  /** Conflict: save the user's own text as the next version after theirs. */
  keepMine(): void {
    const theirs = this.conflict();
    if (theirs) this.save(theirs.version, this.draft());
  }

  /** Conflict: save the text as merged by hand. */
  saveMerged(text: string): void {
    const theirs = this.conflict();
    if (theirs) this.save(theirs.version, text);
  }

  /** Conflict: take their version into the editor; the user's text is set aside, not dropped. */
  takeTheirs(): void {
    const theirs = this.conflict();
    if (!theirs) return;
    this.setAside.set(this.draft());
    this.adopt(theirs);
    clearDraft(theirs.id);
    this.conflict.set(null);
    this.saveState.set('idle');
    this.edits$.next(theirs.source);
  }

  bringBackMine(): void {
    const mine = this.setAside();
    if (mine === null) return;
    this.setAside.set(null);
    this.edit(mine);
  }

  /** Put an old version's text in the editor and save it as the next version. */
  restore(source: string): void {
    const base = this.base();
    if (!base) return;
    this.draft.set(source);
    this.save(base.version, source);
    this.edits$.next(source);
  }

  forget(id: number): void {
    clearDraft(id);
    this.base.set(null);
  }

  /** A blocked draft (a conflict, or too long to save) is the only one that needs a question on leaving. */
  blockedDraft(): boolean {
    return this.canEdit() && this.dirty() && (this.saveState() === 'conflict' || this.tooLong());
  }

  canSaveOnLeave(): boolean {
    return this.canEdit() && this.dirty() && this.saveState() !== 'conflict';
  }

  /**
   * On unload HttpClient's usual request would be cut off; a keepalive request outlives the
   * page (the fetch backend passes `keepalive` on, and the XSRF interceptor adds its header).
   * The draft also stays in localStorage.
   */
  saveOnUnload(): void {
    const base = this.base();
    if (!base || !this.canSaveOnLeave()) return;
    const title = this.draftTitle().trim();
    this.api
      .save(base.id, { source: this.draft(), baseVersion: base.version, ...(title && title !== base.title ? { title } : {}) }, { keepalive: true })
      .subscribe({ error: () => undefined });
  }

  private afterEdit(): void {
    const base = this.base();
    if (!base || !this.canEdit()) return;
    if (this.saveState() === 'saved' || this.saveState() === 'error') this.saveState.set('idle');
    if (this.dirty()) writeDraft(base.id, { source: this.draft(), title: this.draftTitle(), baseVersion: base.version });
    else clearDraft(base.id);
    this.edits$.next(this.draft());
    this.scheduleAutosave();
  }

  private onSaved(saved: WorksheetDto, title: string, text: string | undefined): void {
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
    this.saved$.next(saved);
  }

  private onSaveFailed(err: unknown, sentSource: string): void {
    const conflict = versionConflict(err);
    if (conflict) {
      this.conflict.set(conflict.current);
      this.merged.set(sentSource);
      this.saveState.set('conflict');
      return;
    }
    const unreachable = err instanceof HttpErrorResponse && err.status === 0;
    this.saveError.set(
      unreachable
        ? 'the server could not be reached; your text is kept in this browser and saving will be tried again'
        : apiErrorMessage(err),
    );
    this.saveState.set('error');
    if (err instanceof HttpErrorResponse && (err.status === 0 || err.status >= 500)) {
      this.retryTimer = setTimeout(() => this.save(), RETRY_MS);
    }
  }

  private scheduleAutosave(): void {
    if (this.autosaveTimer) clearTimeout(this.autosaveTimer);
    this.autosaveTimer = setTimeout(() => {
      this.autosaveTimer = null;
      if (!this.dirty() || this.saveState() === 'conflict') return;
      if (this.saveState() === 'saving') this.scheduleAutosave();
      else this.save();
    }, AUTOSAVE_DELAY_MS);
  }

  private clearTimers(): void {
    if (this.autosaveTimer) clearTimeout(this.autosaveTimer);
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.autosaveTimer = this.retryTimer = null;
  }

  private adopt(ws: WorksheetDto): void {
    this.base.set(ws);
    this.draft.set(ws.source);
    this.draftTitle.set(ws.title);
    this.pageTitle.setTitle(`${ws.title} · Sheetwise`);
  }
}
