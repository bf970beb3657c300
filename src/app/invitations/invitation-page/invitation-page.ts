import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { Router, RouterLink } from '@angular/router';
import { catchError, forkJoin, of, switchMap, tap } from 'rxjs';
import { LIMITS, loginBody, registerBody } from '@shared/api';
import type { InvitationPreviewDto } from '@shared/collaboration';
import { AuthFrame } from '../../auth/auth-frame/auth-frame';
import { AuthStore } from '../../core/auth/auth-store';
import { FormField } from '../../core/forms/form-field';
import { applySchemaIssues } from '../../core/forms/schema-errors';
import { apiErrorCode, apiErrorDetails, apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { ROLE_DESCRIPTIONS } from '../../groups/roles';
import { InvitationsApi } from '../invitations-api';

/** Why a link cannot be used any more, as a heading; the server's sentence says what to do. */
const GONE_HEADINGS: Record<string, string> = {
  invitation_used: 'This invitation was used',
  invitation_expired: 'This invitation has expired',
  invitation_revoked: 'This invitation was withdrawn',
  invitation_unknown: 'This invitation link is not valid',
};

/** How the visitor accepts: as the signed-in account, with the existing account's password, or by signing up. */
type Mode = 'signed-in' | 'existing' | 'new';

const newAccountBody = registerBody.pick({ displayName: true, password: true });
const existingAccountBody = loginBody.pick({ password: true });

/** /invitations/:token — the page the invitation mail links to; no sign-in needed to open it. */
@Component({
  selector: 'app-invitation-page',
  imports: [DatePipe, ReactiveFormsModule, MatButtonModule, RouterLink, AuthFrame, FormField],
  templateUrl: './invitation-page.html',
  styleUrls: ['../../auth/sign-in/sign-in.scss', './invitation-page.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class InvitationPage {
  private readonly api = inject(InvitationsApi);
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  /** The route parameter :token. */
  readonly token = input.required<string>();

  protected readonly limits = LIMITS;
  protected readonly descriptions = ROLE_DESCRIPTIONS;
  protected readonly invitation = signal<InvitationPreviewDto | null>(null);
  protected readonly loading = signal(true);
  /** The link cannot be used: a heading and the server's sentence. */
  protected readonly gone = signal<{ heading: string; text: string } | null>(null);
  protected readonly error = signal<string | null>(null);
  protected readonly submitting = signal(false);
  protected readonly user = this.auth.user;

  protected readonly mode = computed<Mode>(() => {
    if (this.user()) return 'signed-in';
    return this.invitation()?.accountExists ? 'existing' : 'new';
  });
  protected readonly otherAccount = computed(() => {
    const user = this.user();
    const invitation = this.invitation();
    return !!user && !!invitation && user.email.trim().toLowerCase() !== invitation.email.trim().toLowerCase();
  });
  protected readonly heading = computed(() => {
    const invitation = this.invitation();
    if (invitation) return `Join ${invitation.groupName}`;
    return this.gone()?.heading ?? 'Invitation';
  });

  protected readonly form = inject(NonNullableFormBuilder).group({
    displayName: [''],
    password: [''],
  });

  constructor() {
    toObservable(this.token)
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.gone.set(null);
          this.error.set(null);
          this.invitation.set(null);
        }),
        switchMap((token) =>
          forkJoin({
            // Whether someone is signed in decides the form; a failure here only means "not signed in".
            user: this.auth.ensureLoaded().pipe(catchError(() => of(null))),
            invitation: this.api.preview(token).pipe(
              catchError((err: unknown) => {
                this.fail(err);
                return of(null);
              }),
            ),
          }),
        ),
        takeUntilDestroyed(),
      )
      .subscribe(({ invitation }) => {
        this.loading.set(false);
        this.invitation.set(invitation);
      });
  }

  /** Signed in as another account than the invited one: sign out here, and the form asks for the invited account. */
  protected signOut(): void {
    this.submitting.set(true);
    this.auth.signOut().subscribe({
      next: () => this.submitting.set(false),
      error: (err: unknown) => {
        this.submitting.set(false);
        this.error.set(apiErrorMessage(err));
      },
    });
  }

  protected accept(): void {
    const invitation = this.invitation();
    if (!invitation || this.submitting() || this.otherAccount()) return;
    const raw = this.form.getRawValue();
    let body: { displayName?: string; password?: string } = {};
    if (this.mode() !== 'signed-in') {
      const parsed =
        this.mode() === 'new'
          ? newAccountBody.safeParse(raw)
          : existingAccountBody.safeParse({ password: raw.password });
      if (!parsed.success) {
        applySchemaIssues(this.form, parsed.error.issues);
        return;
      }
      body = parsed.data;
    }
    this.error.set(null);
    this.submitting.set(true);
    this.api
      .accept(this.token(), body)
      .pipe(
        // The answer signed the visitor in (or kept them signed in): ask who we are now.
        switchMap((accepted) => this.auth.refresh().pipe(catchError(() => of(null)), switchMap(() => of(accepted)))),
      )
      .subscribe({
        next: ({ groupId }) => {
          this.submitting.set(false);
          this.notifier.info(`Welcome to ${invitation.groupName}. You are ${this.article(invitation.role)} ${invitation.role}.`);
          void this.router.navigate(['/groups', groupId]);
        },
        error: (err: unknown) => {
          this.submitting.set(false);
          const status = (err as { status?: number }).status;
          if (status === 404 || status === 410) {
            this.invitation.set(null);
            this.fail(err);
            return;
          }
          this.error.set(apiErrorMessage(err));
          applySchemaIssues(
            this.form,
            Object.entries(apiErrorDetails(err)).map(([path, message]) => ({ path: [path], message })),
          );
        },
      });
  }

  private fail(err: unknown): void {
    const code = apiErrorCode(err) ?? '';
    const status = (err as { status?: number }).status;
    if (status === 404 || status === 410) {
      this.gone.set({ heading: GONE_HEADINGS[code] ?? 'This invitation cannot be used', text: apiErrorMessage(err) });
    } else {
      this.error.set(apiErrorMessage(err));
    }
  }

  private article(role: string): string {
    return role === 'owner' || role === 'author' ? 'an' : 'a';
  }
}
