import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { FormGroup, FormGroupDirective, NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { MatTooltipModule } from '@angular/material/tooltip';
import { catchError, of, switchMap, tap } from 'rxjs';
import { GROUP_ROLES, roleCan, type GroupRole, type MemberDto } from '@shared/api';
import { INVITATION_DAYS, inviteBody, type InvitationDto } from '@shared/collaboration';
import { applySchemaIssues, fieldMessage } from '../../core/forms/schema-errors';
import { apiErrorDetails, apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { InvitationsApi } from '../../invitations/invitations-api';
import { GroupsApi } from '../groups-api';
import { ROLE_DESCRIPTIONS } from '../roles';
import { Confirmer } from '../../core/dialogs/confirmer';

export { ROLE_DESCRIPTIONS };

/**
 * The members of a group; the owner invites people by e-mail (a link by mail, for that
 * address only: nobody joins without accepting, with or without an account), changes
 * roles, removes members and withdraws invitations.
 */
@Component({
  selector: 'app-group-members',
  imports: [
    DatePipe,
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
  private readonly confirmer = inject(Confirmer);
  private readonly api = inject(GroupsApi);
  private readonly invitationsApi = inject(InvitationsApi);
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
  private readonly reload = signal(0);

  protected readonly invitationDays = INVITATION_DAYS;
  protected readonly invitations = signal<InvitationDto[]>([]);
  protected readonly invitationsError = signal<string | null>(null);
  protected readonly inviting = signal(false);
  protected readonly inviteError = signal<string | null>(null);
  protected readonly busyInvitation = signal<number | null>(null);
  protected readonly invitationColumns = ['email', 'role', 'invitedBy', 'expiresAt', 'actions'];

  protected readonly inviteForm = inject(NonNullableFormBuilder).group({
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

    // Pending invitations: only owners may see them.
    toObservable(computed(() => ({ groupId: this.groupId(), manage: this.canManage(), reload: this.reload() })))
      .pipe(
        tap(() => this.invitationsError.set(null)),
        switchMap(({ groupId, manage }) =>
          manage
            ? this.invitationsApi.pending(groupId).pipe(
                catchError((err: unknown) => {
                  this.invitationsError.set(apiErrorMessage(err));
                  return of(null);
                }),
              )
            : of([]),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((invitations) => {
        if (invitations) this.invitations.set(invitations);
      });
  }

  protected retry(): void {
    this.reload.update((n) => n + 1);
  }

  protected invite(directive?: FormGroupDirective): void {
    if (this.inviting()) return;
    const parsed = inviteBody.safeParse(this.inviteForm.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.inviteForm, parsed.error.issues);
      return;
    }
    this.inviteError.set(null);
    this.inviting.set(true);
    this.invitationsApi.invite(this.groupId(), parsed.data).subscribe({
      next: (invitation) => {
        this.inviting.set(false);
        this.invitations.update((list) => [invitation, ...list.filter((i) => i.id !== invitation.id)]);
        this.resetForm(this.inviteForm, directive, { email: '', role: parsed.data.role });
        this.notifier.info(`Invitation sent to ${invitation.email}.`);
      },
      error: (err: unknown) => {
        this.inviting.set(false);
        // A 409 (already a member) or a 429 says what to do instead: show it beside the form.
        this.inviteError.set(apiErrorMessage(err));
        applySchemaIssues(
          this.inviteForm,
          Object.entries(apiErrorDetails(err)).map(([path, message]) => ({ path: [path], message })),
        );
      },
    });
  }

  protected revoke(invitation: InvitationDto): void {
    this.confirmer
      .ask({ title: 'Withdraw this invitation?', message: `Withdraw the invitation to ${invitation.email}? Its link stops working.`, confirm: 'Withdraw', danger: true })
      .subscribe((ok) => ok && this.revokeNow(invitation));
  }

  private revokeNow(invitation: InvitationDto): void {
    this.busyInvitation.set(invitation.id);
    this.invitationsApi.revoke(this.groupId(), invitation.id).subscribe({
      next: () => {
        this.busyInvitation.set(null);
        this.invitations.update((list) => list.filter((i) => i.id !== invitation.id));
        this.notifier.info(`The invitation to ${invitation.email} was withdrawn.`);
      },
      error: (err: unknown) => {
        this.busyInvitation.set(null);
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
    this.confirmer
      .ask({ title: 'Remove this member?', message: `Remove ${member.displayName} from this group?`, confirm: 'Remove', danger: true })
      .subscribe((ok) => ok && this.removeNow(member));
  }

  private removeNow(member: MemberDto): void {
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

  /** Empty a form after sending it; through its directive, so the emptied field is not flagged by the last submit. */
  private resetForm(
    form: FormGroup,
    directive: FormGroupDirective | undefined,
    value: { email: string; role: GroupRole },
  ): void {
    if (directive) directive.resetForm(value);
    else form.reset(value);
  }

  private article(role: GroupRole): string {
    return role === 'owner' || role === 'author' ? 'an' : 'a';
  }
}
