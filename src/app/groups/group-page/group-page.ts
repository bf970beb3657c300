import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatTabsModule } from '@angular/material/tabs';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import { catchError, of, switchMap, tap } from 'rxjs';
import { LIMITS, groupBody, roleCan, type GroupSummaryDto } from '@shared/api';
import { AuthStore } from '../../core/auth/auth-store';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { ActivityList } from '../../activity/activity-list/activity-list';
import { ImportPanel } from '../../files/import-panel/import-panel';
import { GroupReviews } from '../../reviews/group-reviews/group-reviews';
import { GroupMembers } from '../group-members/group-members';
import { GroupsApi } from '../groups-api';
import { WorksheetTable } from '../worksheet-table/worksheet-table';
import { Confirmer } from '../../core/dialogs/confirmer';

@Component({
  selector: 'app-group-page',
  imports: [
    FormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatTabsModule,
    GroupMembers,
    WorksheetTable,
    ImportPanel,
    GroupReviews,
    ActivityList,
  ],
  templateUrl: './group-page.html',
  styleUrl: './group-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GroupPage {
  private readonly confirmer = inject(Confirmer);
  private readonly api = inject(GroupsApi);
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);
  private readonly title = inject(Title);

  /** The route parameter :groupId. */
  readonly groupId = input.required<string>();
  protected readonly id = computed(() => Number(this.groupId()));

  protected readonly limits = LIMITS;
  protected readonly group = signal<GroupSummaryDto | null>(null);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly userId = computed(() => this.auth.user()?.id ?? null);
  protected readonly canManage = computed(() => roleCan(this.group()?.role, 'manageGroup'));
  protected readonly canImport = computed(() => roleCan(this.group()?.role, 'editWorksheets'));
  protected readonly renaming = signal(false);
  protected readonly newName = signal('');
  protected readonly renameError = signal<string | null>(null);

  constructor() {
    toObservable(this.id)
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.error.set(null);
          this.group.set(null);
        }),
        switchMap((id) =>
          Number.isInteger(id) && id > 0
            ? this.api.get(id).pipe(
                catchError((err: unknown) => {
                  this.error.set(apiErrorMessage(err));
                  return of(null);
                }),
              )
            : (this.error.set('There is no group at this address.'), of(null)),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((group) => {
        this.loading.set(false);
        this.group.set(group);
        if (group) this.title.setTitle(`${group.name} · Sheetwise`);
      });
  }

  protected startRename(): void {
    this.newName.set(this.group()?.name ?? '');
    this.renameError.set(null);
    this.renaming.set(true);
  }

  protected rename(): void {
    const parsed = groupBody.safeParse({ name: this.newName() });
    if (!parsed.success) {
      this.renameError.set(parsed.error.issues[0]?.message ?? 'Enter a group name.');
      return;
    }
    this.api.rename(this.id(), parsed.data.name).subscribe({
      next: (group) => {
        this.group.set(group);
        this.renaming.set(false);
        this.title.setTitle(`${group.name} · Sheetwise`);
        this.notifier.info('Group renamed.');
      },
      error: (err: unknown) => this.renameError.set(apiErrorMessage(err)),
    });
  }

  protected deleteGroup(): void {
    const group = this.group();
    if (!group) return;
    this.confirmer
      .ask({ title: 'Delete this group?', message: `Delete the group “${group.name}” with its ${group.worksheetCount} worksheet(s)? This cannot be undone.`, confirm: 'Delete the group', danger: true })
      .subscribe((ok) => ok && this.deleteNow(group));
  }

  private deleteNow(group: GroupSummaryDto): void {
    this.api.remove(group.id).subscribe({
      next: () => {
        this.notifier.info(`Group “${group.name}” deleted.`);
        void this.router.navigate(['/groups']);
      },
      error: (err: unknown) => this.notifier.error(err),
    });
  }
}
