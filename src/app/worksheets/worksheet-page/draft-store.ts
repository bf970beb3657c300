import { HttpErrorResponse } from '@angular/common/http';
import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { Title } from '@angular/platform-browser';
import { Subject } from 'rxjs';
import { LIMITS, roleCan, type WorksheetDto } from '@shared/api';
import { HEAD_POLL_MS, type HeadDto } from '@shared/versions-api';
import { apiErrorMessage, versionConflict } from '../../core/http/api-error';
import { WorksheetsApi } from '../worksheets-api';
import { clearDraft, readDraft, writeDraft } from './worksheet-drafts';

export type SaveState = 'idle' | 'saving' | 'saved' | 'conflict' | 'error';
/** The draft on the server: none (the text is a version), being kept, kept, or not kept (kept in this browser meanwhile). */
export type DraftState = 'none' | 'keeping' | 'kept' | 'error';

/** Typing pause before the draft is kept on the server. */
export const AUTOSAVE_DELAY_MS = 1500;
const RETRY_MS = 10_000;

/**
 * The text being edited and its way to the server, for one worksheet page (provided by the
 * page, not the root): the draft and title, the version they are based on, the copy kept in
 * this browser and the one kept on the server after each pause (a draft: no version, no
 * activity line; the server turns a long-edited draft into an automatic version at most
 * once per ten minutes), versions made by an explicit save (a checkpoint, with an optional
 * name), retry after a network failure, the state of a save that lost the race (a conflict
 * is shown, never overwritten), and news of a newer version saved elsewhere: the latest
 * version number is polled every few seconds while the page is visible and at once when it
 * comes back (a plain GET of a few bytes that works the same whichever server process
 * answers; server-sent events would hold a connection per open page and need the server
 * processes to tell each other of saves).
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
  readonly draftState = signal<DraftState>('none');
  /** A version newer than the base, saved elsewhere while this page has unsaved text. */
  readonly newer = signal<HeadDto | null>(null);
  /** A newer version was loaded into this page because it had no unsaved text. */
  readonly loadedNewer = signal<HeadDto | null>(null);

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
  private pollTimer: ReturnType<typeof setInterval> | null = null;
  private readonly onReturn = () => {
    if (document.visibilityState === 'visible') this.pollHead();
  };

  constructor() {
    this.pollTimer = setInterval(() => {
      if (document.visibilityState === 'visible') this.pollHead();
    }, HEAD_POLL_MS);
    document.addEventListener('visibilitychange', this.onReturn);
    window.addEventListener('focus', this.onReturn);
    inject(DestroyRef).onDestroy(() => {
      this.clearTimers();
      if (this.pollTimer) clearInterval(this.pollTimer);
      document.removeEventListener('visibilitychange', this.onReturn);
      window.removeEventListener('focus', this.onReturn);
      // Leaving the page: keep the draft on the server (the request outlives the page).
      if (this.canSaveOnLeave()) this.keepDraft(true);
    });
  }

  /** A worksheet arrived from the server: take it, or the browser's newer draft of it (or show both). */
  open(ws: WorksheetDto): void {
    this.adopt(ws);
    this.conflict.set(null);
    this.newer.set(null);
    this.saveState.set('idle');
    this.draftState.set('none');
    if (!this.canEdit()) return;
    const local = readDraft(ws.id);
    if (local && local.source !== ws.source) this.takeDraft(ws, local);
    else if (local) clearDraft(ws.id);
    // The draft kept on the server (from this or another browser): taken when it is newer
    // than this browser's copy and nothing was typed meanwhile.
    const shown = this.draft();
    this.api.draft(ws.id).subscribe({
      next: (server) => {
        if (!server || this.base()?.id !== ws.id || this.draft() !== shown) return;
        if (local && local.savedAt >= server.updatedAt) return;
        if (server.source === shown) return this.draftState.set('kept');
        this.takeDraft(ws, { source: server.source, title: server.title, baseVersion: server.baseVersion, savedAt: server.updatedAt }, true);
      },
      error: () => undefined,
    });
  }

  /** Puts a kept draft in the editor: on top of its version, or beside a newer one as a conflict. */
  private takeDraft(ws: WorksheetDto, local: { source: string; title: string; baseVersion: number; savedAt: string }, fromServer = false): void {
    if (fromServer) this.draftState.set('kept');
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

  /** Save a version now (a checkpoint, optionally named) unless a conflict waits for a choice. */
  saveNow(name?: string): void {
    if (this.canEdit() && this.saveState() !== 'conflict') this.save(undefined, undefined, { name });
  }

  /** Keep the draft on the server now (leaving or hiding the page); no version is made. */
  keepDraftNow(): void {
    if (this.canSaveOnLeave()) this.keepDraft(true);
  }

  /** Save the draft (or a given text) as a version on top of the version it is based on, or on top of theirs. */
  save(onTopOf?: number, text?: string, o: { name?: string; restoredFrom?: number } = {}): void {
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
      .save(base.id, {
        source: sentSource,
        baseVersion: onTopOf ?? base.version,
        ...(title !== base.title ? { title } : {}),
        ...(o.name?.trim() ? { name: o.name.trim() } : {}),
        ...(o.restoredFrom ? { restoredFrom: o.restoredFrom } : {}),
      })
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
    this.api.discardDraft(theirs.id).subscribe({ error: () => undefined });
    this.draftState.set('none');
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
  restore(source: string, fromVersion?: number): void {
    const base = this.base();
    if (!base) return;
    this.draft.set(source);
    this.save(base.version, source, { restoredFrom: fromVersion });
    this.edits$.next(source);
  }

  /** A newer version is known and this page has unsaved text: show theirs beside it (the conflict dialog). */
  compareWithNewer(): void {
    const base = this.base();
    if (!base) return;
    this.api.get(base.id).subscribe({
      next: (theirs) => {
        if (theirs.version === base.version) return this.newer.set(null);
        this.newer.set(null);
        this.merged.set(this.draft());
        this.conflict.set(theirs);
        this.saveState.set('conflict');
      },
      error: () => undefined,
    });
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
    if (this.canSaveOnLeave()) this.keepDraft(true);
  }

  /**
   * Keeps the draft on the server (no version, no activity line). The answer names the
   * latest version: a newer one is shown as news; the server may have made the draft an
   * automatic version (at most one per ten minutes of editing), which becomes the base.
   */
  private keepDraft(keepalive = false): void {
    const base = this.base();
    if (!base || !this.canEdit() || this.tooLong()) return;
    const title = this.draftTitle().trim() || base.title;
    const source = this.draft();
    this.draftState.set('keeping');
    this.api.keepDraft(base.id, { title, source, baseVersion: base.version }, { keepalive }).subscribe({
      next: (r) => {
        if (keepalive || this.base()?.id !== base.id) return;
        if (r.autoVersion && r.worksheet.source === source) {
          this.onSaved(r.worksheet, title, undefined);
          this.draftState.set('none');
          return;
        }
        this.draftState.set(r.draft ? 'kept' : 'none');
        this.noteHead({ version: r.worksheet.version, title: r.worksheet.title, updatedAt: r.worksheet.updatedAt, updatedBy: r.worksheet.updatedBy });
      },
      error: (err: unknown) => {
        if (keepalive) return;
        this.draftState.set('error');
        if (err instanceof HttpErrorResponse && (err.status === 0 || err.status >= 500)) {
          this.retryTimer = setTimeout(() => this.keepDraft(), RETRY_MS);
        }
      },
    });
  }

  /** Asks for the latest version number (plain fetch: no loading bar for a background check). */
  private pollHead(): void {
    const base = this.base();
    if (!base || this.saveState() === 'saving' || this.saveState() === 'conflict') return;
    fetch(`/api/worksheets/${base.id}/head`, { credentials: 'same-origin', headers: { accept: 'application/json' } })
      .then((res) => (res.ok ? (res.json() as Promise<HeadDto>) : null))
      .then((head) => head && this.base()?.id === base.id && this.noteHead(head))
      .catch(() => undefined);
  }

  /** A newer version than the base: loaded at once when nothing is unsaved here, else announced. */
  private noteHead(head: HeadDto): void {
    const base = this.base();
    if (!base || head.version <= base.version) return;
    if (this.newer()?.version === head.version) return;
    if (!this.dirty() && this.saveState() !== 'saving') {
      this.api.get(base.id).subscribe({
        next: (ws) => {
          if (this.dirty() || this.base()?.id !== ws.id) return this.newer.set(head);
          this.adopt(ws);
          this.loadedNewer.set(head);
          this.edits$.next(ws.source);
          this.saved$.next(ws);
        },
        error: () => undefined,
      });
      return;
    }
    this.newer.set(head);
  }

  private afterEdit(): void {
    const base = this.base();
    if (!base || !this.canEdit()) return;
    if (this.saveState() === 'saved' || this.saveState() === 'error') this.saveState.set('idle');
    // Typed since the draft was kept: kept again at the next pause.
    if (this.draftState() === 'kept') this.draftState.set('none');
    if (this.dirty()) writeDraft(base.id, { source: this.draft(), title: this.draftTitle(), baseVersion: base.version });
    else clearDraft(base.id);
    this.edits$.next(this.draft());
    this.scheduleAutosave();
  }

  /** The text saved as a version is the one on the server: the draft there is gone. */
  private onSaved(saved: WorksheetDto, title: string, text: string | undefined): void {
    this.base.set(saved);
    if (text !== undefined) this.draft.set(text);
    if (this.draftTitle().trim() === title) this.draftTitle.set(saved.title);
    this.conflict.set(null);
    this.newer.set(null);
    this.saveState.set('saved');
    this.draftState.set('none');
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
      if (this.saveState() === 'saving' || this.draftState() === 'keeping') this.scheduleAutosave();
      else this.keepDraft();
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
