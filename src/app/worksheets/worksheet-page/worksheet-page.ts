import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { catchError, of, switchMap, tap } from 'rxjs';
import { LIMITS, roleCan, type WorksheetDto, type WorksheetVersionDto } from '@shared/api';
import { apiErrorMessage, versionConflict } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { HasUnsavedChanges } from '../unsaved-changes-guard';
import { GroupsApi } from '../../groups/groups-api';
import { WorksheetsApi } from '../worksheets-api';

type SaveState = 'idle' | 'saving' | 'saved' | 'conflict' | 'error';

/**
 * One worksheet: its source (a plain text area for now) and its versions.
 * Authors and owners edit and save; every save names the version it was based on,
 * and a save that lost the race shows the other version without dropping the user's text.
 */
@Component({
  selector: 'app-worksheet-page',
  imports: [DatePipe, RouterLink, MatButtonModule, MatFormFieldModule, MatInputModule],
  templateUrl: './worksheet-page.html',
  styleUrl: './worksheet-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    '(window:beforeunload)': 'onBeforeUnload($event)',
  },
})
export class WorksheetPage implements HasUnsavedChanges {
  private readonly api = inject(WorksheetsApi);
  private readonly groups = inject(GroupsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly pageTitle = inject(Title);

  /** The route parameter :id. */
  readonly id = input.required<string>();
  private readonly worksheetId = computed(() => Number(this.id()));

  protected readonly limits = LIMITS;
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
  /** The user's own text, kept after "load theirs" so it can be brought back. */
  protected readonly setAside = signal<string | null>(null);

  protected readonly groupName = signal<string | null>(null);
  protected readonly versions = signal<WorksheetVersionDto[]>([]);
  protected readonly versionsError = signal<string | null>(null);
  protected readonly openVersion = signal<number | null>(null);

  protected readonly canEdit = computed(() => roleCan(this.base()?.role, 'editWorksheets'));
  protected readonly dirty = computed(() => {
    const base = this.base();
    return !!base && (this.draft() !== base.source || this.draftTitle().trim() !== base.title);
  });
  protected readonly lineCount = computed(() => this.draft().split('\n').length);
  protected readonly tooLong = computed(() => this.draft().length > LIMITS.worksheetSourceLength);

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

  constructor() {
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
        this.adopt(ws);
        this.conflict.set(null);
        this.saveState.set('idle');
        this.loadVersions();
        this.groups.get(ws.groupId).subscribe({
          next: (g) => this.groupName.set(g.name),
          error: () => this.groupName.set(null),
        });
      });
  }

  hasUnsavedChanges(): boolean {
    return this.canEdit() && this.dirty();
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    if (this.hasUnsavedChanges()) event.preventDefault();
  }

  protected onKeydown(event: KeyboardEvent): void {
    if ((event.ctrlKey || event.metaKey) && event.key.toLowerCase() === 's') {
      event.preventDefault();
      if (this.canEdit()) this.save();
    }
  }

  /** Save the draft on top of the version it is based on (or, after a conflict, on top of theirs). */
  save(onTopOf?: number): void {
    const base = this.base();
    if (!base || !this.canEdit() || this.saveState() === 'saving') return;
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
    const sentSource = this.draft();
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
          // Keep anything typed while the save was on its way.
          if (this.draftTitle().trim() === title) this.draftTitle.set(saved.title);
          this.conflict.set(null);
          this.saveState.set('saved');
          this.pageTitle.setTitle(`${saved.title} · Sheetwise`);
          this.loadVersions();
        },
        error: (err: unknown) => {
          const conflict = versionConflict(err);
          if (conflict) {
            this.conflict.set(conflict.current);
            this.saveState.set('conflict');
          } else {
            this.saveError.set(apiErrorMessage(err));
            this.saveState.set('error');
          }
        },
      });
  }

  /** Take the other person's version into the editor; the user's text is set aside, not dropped. */
  protected loadTheirs(): void {
    const theirs = this.conflict();
    if (!theirs) return;
    this.setAside.set(this.draft());
    this.adopt(theirs);
    this.conflict.set(null);
    this.saveState.set('idle');
    this.loadVersions();
  }

  /** Save the user's text as the next version after theirs. */
  protected saveMineOnTop(): void {
    const theirs = this.conflict();
    if (!theirs) return;
    this.save(theirs.version);
  }

  protected bringBackMine(): void {
    const mine = this.setAside();
    if (mine === null) return;
    this.draft.set(mine);
    this.setAside.set(null);
  }

  protected deleteWorksheet(): void {
    const base = this.base();
    if (!base) return;
    if (!window.confirm(`Delete the worksheet “${base.title}” and all its versions? This cannot be undone.`)) return;
    this.api.remove(base.id).subscribe({
      next: () => {
        this.base.set(null);
        this.notifier.info(`Worksheet “${base.title}” deleted.`);
        void this.router.navigate(['/groups', base.groupId]);
      },
      error: (err: unknown) => this.notifier.error(err),
    });
  }

  protected toggleVersion(n: number): void {
    this.openVersion.update((open) => (open === n ? null : n));
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
