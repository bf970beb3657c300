import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { Router, RouterLink } from '@angular/router';
import { LIMITS, registerBody } from '@shared/api';
import { AuthStore } from '../../core/auth/auth-store';
import { FormField } from '../../core/forms/form-field';
import { applySchemaIssues } from '../../core/forms/schema-errors';
import { apiErrorDetails, apiErrorMessage } from '../../core/http/api-error';
import { AuthFrame } from '../auth-frame/auth-frame';

@Component({
  selector: 'app-register',
  imports: [ReactiveFormsModule, MatButtonModule, RouterLink, AuthFrame, FormField],
  templateUrl: './register.html',
  styleUrl: '../sign-in/sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Register {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);

  protected readonly limits = LIMITS;
  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required]],
    displayName: ['', [Validators.required]],
    password: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly error = signal<string | null>(null);

  protected submit(): void {
    if (this.submitting()) return;
    const parsed = registerBody.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.form, parsed.error.issues);
      return;
    }
    this.error.set(null);
    this.submitting.set(true);
    this.auth.register(parsed.data).subscribe({
      next: () => {
        this.submitting.set(false);
        void this.router.navigate(['/groups']);
      },
      error: (err: unknown) => {
        this.submitting.set(false);
        this.error.set(apiErrorMessage(err));
        const details = apiErrorDetails(err);
        applySchemaIssues(
          this.form,
          Object.entries(details).map(([path, message]) => ({ path: [path], message })),
        );
      },
    });
  }
}
