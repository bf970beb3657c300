import { ChangeDetectionStrategy, Component, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { LIMITS } from '@shared/api';
import { resetConfirmBody } from '@shared/collaboration';
import { AuthStore } from '../../core/auth/auth-store';
import { FormField } from '../../core/forms/form-field';
import { applySchemaIssues } from '../../core/forms/schema-errors';
import { apiErrorCode, apiErrorMessage } from '../../core/http/api-error';
import { AuthFrame } from '../auth-frame/auth-frame';

/** /reset-password/:token — the page the reset mail links to: choose a new password. */
@Component({
  selector: 'app-reset-password',
  imports: [ReactiveFormsModule, MatButtonModule, RouterLink, AuthFrame, FormField],
  templateUrl: './reset-password.html',
  styleUrls: ['../sign-in/sign-in.scss', '../outcome.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ResetPassword {
  private readonly auth = inject(AuthStore);

  /** The route parameter :token. */
  readonly token = input.required<string>();

  protected readonly limits = LIMITS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    password: ['', [Validators.required]],
    repeat: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly error = signal<string | null>(null);
  /** The link is used, expired or mistyped: only a new one helps. */
  protected readonly invalidLink = signal(false);
  protected readonly done = signal(false);

  protected submit(): void {
    if (this.submitting()) return;
    const { password, repeat } = this.form.getRawValue();
    const parsed = resetConfirmBody.safeParse({ token: this.token(), password });
    if (!parsed.success) {
      applySchemaIssues(
        this.form,
        parsed.error.issues.filter((i) => i.path[0] === 'password'),
      );
      if (parsed.error.issues.some((i) => i.path[0] === 'token')) {
        this.invalidLink.set(true);
        this.error.set('This reset link is incomplete. Open it again from the mail, or ask for a new one.');
      }
      return;
    }
    if (password !== repeat) {
      applySchemaIssues(this.form, [{ path: ['repeat'], message: 'The two passwords differ. Type the same one twice.' }]);
      return;
    }
    this.error.set(null);
    this.submitting.set(true);
    this.auth.resetPassword(parsed.data.token, parsed.data.password).subscribe({
      next: () => {
        this.submitting.set(false);
        this.done.set(true);
        // The server ended every session of the account; if it was ours, the client learns it now.
        if (this.auth.signedIn()) this.auth.refresh().subscribe({ error: () => this.auth.forget() });
      },
      error: (err: unknown) => {
        this.submitting.set(false);
        this.invalidLink.set(apiErrorCode(err) === 'reset_invalid');
        this.error.set(apiErrorMessage(err));
      },
    });
  }
}
