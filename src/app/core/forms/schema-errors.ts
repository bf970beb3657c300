import { AbstractControl, FormGroup } from '@angular/forms';

interface Issue {
  path: PropertyKey[];
  message: string;
}

/**
 * Put the messages of a failed shared-schema check (or a 400's details) on the form's
 * controls, as the error `schema`, so each field shows its own sentence.
 */
export function applySchemaIssues(form: FormGroup, issues: readonly Issue[]): void {
  for (const issue of issues) {
    const control = form.get(String(issue.path[0] ?? ''));
    if (control && !control.hasError('schema')) {
      control.setErrors({ ...(control.errors ?? {}), schema: issue.message });
    }
  }
  form.markAllAsTouched();
}

/** The sentence to show under a field, or null. */
export function fieldMessage(control: AbstractControl, fallback: string): string | null {
  if (!control.errors) return null;
  const schema = control.errors['schema'];
  return typeof schema === 'string' ? schema : fallback;
}
