import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { loginBody } from '@shared/api';
import { AuthStore } from '../../core/auth/auth-store';
import { FormField } from '../../core/forms/form-field';
import { applySchemaIssues } from '../../core/forms/schema-errors';
import { apiErrorMessage } from '../../core/http/api-error';
import { AuthFrame } from '../auth-frame/auth-frame';

@Component({
  selector: 'app-sign-in',
  imports: [ReactiveFormsModule, MatButtonModule, RouterLink, AuthFrame, FormField],
  templateUrl: './sign-in.html',
  styleUrl: './sign-in.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignIn {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);

  protected readonly form = inject(NonNullableFormBuilder).group({
    email: ['', [Validators.required]],
    password: ['', [Validators.required]],
  });
  protected readonly submitting = signal(false);
  protected readonly error = signal<string | null>(null);

  protected submit(): void {
    if (this.submitting()) return;
    const parsed = loginBody.safeParse(this.form.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.form, parsed.error.issues);
      return;
    }
    this.error.set(null);
    this.submitting.set(true);
    this.auth.signIn(parsed.data).subscribe({
      next: () => {
        this.submitting.set(false);
        void this.router.navigateByUrl(this.safeReturnUrl());
      },
      error: (err: unknown) => {
        this.submitting.set(false);
        this.error.set(apiErrorMessage(err));
      },
    });
  }

  /** Only return to a path inside the app. */
  private safeReturnUrl(): string {
    const url = this.route.snapshot.queryParamMap.get('returnUrl') ?? '';
    return url.startsWith('/') && !url.startsWith('//') && !url.startsWith('/sign-in') ? url : '/groups';
  }
}
