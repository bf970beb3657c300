import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { resetRequestBody } from '@shared/collaboration';
import { AuthStore } from '../../core/auth/auth-store';
import { FormField } from '../../core/forms/form-field';
import { applySchemaIssues } from '../../core/forms/schema-errors';
import { apiErrorMessage } from '../../core/http/api-error';
import { AuthFrame } from '../auth-frame/auth-frame';

/** /forgot-password — ask for a reset link by mail. */
@Component({
  selector: 'app-forgot-password',
  imports: [ReactiveFormsModule, MatButtonModule, RouterLink, AuthFrame, FormField],
  templateUrl: './forgot-password.html',
  styleUrls: ['../sign-in/sign-in.scss', '../outcome.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ForgotPassword {
  private readonly auth = inject(AuthStore);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly error = signal<string | null>(null);
  /** The server's answer, the same whether or not the address has an account. */
  protected readonly sent = signal<string | null>(null);

  protected submit(): void {
    if (this.submitting()) return;
    const parsed = resetRequestBody.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.form, parsed.error.issues);
      return;
    }
    this.error.set(null);
    this.submitting.set(true);
    this.auth.requestPasswordReset(parsed.data.email).subscribe({
      next: (text) => {
        this.submitting.set(false);
        this.sent.set(text);
      },
      error: (err: unknown) => {
        this.submitting.set(false);
        this.error.set(apiErrorMessage(err));
      },
    });
  }

  protected again(): void {
    this.sent.set(null);
  }
}
