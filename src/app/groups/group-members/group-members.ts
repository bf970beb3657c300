import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { catchError, of, switchMap, tap } from 'rxjs';
import { GROUP_ROLES, addMemberBody, roleCan, type GroupRole, type MemberDto } from '@shared/api';
import { applySchemaIssues, fieldMessage } from '../../core/forms/schema-errors';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { GroupsApi } from '../groups-api';

export const ROLE_DESCRIPTIONS: Record<GroupRole, string> = {
  owner: 'manages members and the group, edits worksheets',
  author: 'creates and edits worksheets',
  reviewer: 'reads and reviews results',
  reader: 'reads only',
};

/** The members of a group; the owner adds people by e-mail, changes roles, removes them. */
@Component({
  selector: 'app-group-members',
  imports: [
    ReactiveFormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatTableModule,
    MatTooltipModule,
  ],
  templateUrl: './group-members.html',
  styleUrl: './group-members.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GroupMembers {
  private readonly api = inject(GroupsApi);
  private readonly notifier = inject(Notifier);

  readonly groupId = input.required<number>();
  readonly role = input.required<GroupRole>();
  readonly currentUserId = input<number | null>(null);

  protected readonly roles = GROUP_ROLES;
  protected readonly descriptions = ROLE_DESCRIPTIONS;
  protected readonly message = fieldMessage;
  protected readonly canManage = computed(() => roleCan(this.role(), 'manageMembers'));
  protected readonly columns = computed(() =>
    this.canManage() ? ['name', 'email', 'role', 'actions'] : ['name', 'email', 'role'],
  );

  protected readonly members = signal<MemberDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly busyUser = signal<number | null>(null);
  protected readonly adding = signal(false);
  private readonly reload = signal(0);

  protected readonly addForm = inject(NonNullableFormBuilder).group({
    email: ['', Validators.required],
    role: ['author' as GroupRole, Validators.required],
  });

  constructor() {
    toObservable(computed(() => ({ groupId: this.groupId(), reload: this.reload() })))
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.error.set(null);
        }),
        switchMap(({ groupId }) =>
          this.api.members(groupId).pipe(
            catchError((err: unknown) => {
              this.error.set(apiErrorMessage(err));
              return of(null);
            }),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((members) => {
        this.loading.set(false);
        if (members) this.members.set(members);
      });
  }

  protected retry(): void {
    this.reload.update((n) => n + 1);
  }

  protected add(): void {
    const parsed = addMemberBody.safeParse(this.addForm.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.addForm, parsed.error.issues);
      return;
    }
    this.adding.set(true);
    this.api.addMember(this.groupId(), parsed.data).subscribe({
      next: (member) => {
        this.adding.set(false);
        this.members.update((list) => [...list.filter((m) => m.userId !== member.userId), member]);
        this.addForm.reset({ email: '', role: parsed.data.role });
        this.notifier.info(`${member.displayName} is now ${this.article(member.role)} ${member.role}.`);
      },
      error: (err: unknown) => {
        this.adding.set(false);
        this.notifier.error(err);
      },
    });
  }

  protected changeRole(member: MemberDto, role: GroupRole): void {
    if (role === member.role) return;
    this.busyUser.set(member.userId);
    this.api.changeRole(this.groupId(), member.userId, role).subscribe({
      next: (updated) => {
        this.busyUser.set(null);
        this.members.update((list) => list.map((m) => (m.userId === updated.userId ? updated : m)));
        this.notifier.info(`${updated.displayName} is now ${this.article(updated.role)} ${updated.role}.`);
      },
      error: (err: unknown) => {
        this.busyUser.set(null);
        // Put the select back to the role the server still has.
        this.members.update((list) => [...list]);
        this.notifier.error(err);
      },
    });
  }

  protected remove(member: MemberDto): void {
    if (!window.confirm(`Remove ${member.displayName} from this group?`)) return;
    this.busyUser.set(member.userId);
    this.api.removeMember(this.groupId(), member.userId).subscribe({
      next: () => {
        this.busyUser.set(null);
        this.members.update((list) => list.filter((m) => m.userId !== member.userId));
        this.notifier.info(`${member.displayName} was removed from the group.`);
      },
      error: (err: unknown) => {
        this.busyUser.set(null);
        this.notifier.error(err);
      },
    });
  }

  protected describe(role: GroupRole): string {
    return ROLE_DESCRIPTIONS[role];
  }

  private article(role: GroupRole): string {
    return role === 'owner' || role === 'author' ? 'an' : 'a';
  }
}
