import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { startWith, switchMap } from 'rxjs';
import { fieldMessage } from './schema-errors';

/**
 * One labelled text field of a form (e-mail, password, display name) in the house style:
 * outlined, full width, a hint, and under it the server's or schema's sentence for the field,
 * else `missing`. The control stays the form's own; this only draws it.
 */
@Component({
  selector: 'app-form-field',
  imports: [ReactiveFormsModule, MatFormFieldModule, MatInputModule],
  template: `
    <mat-form-field appearance="outline" class="sw-full">
      <mat-label>{{ label() }}</mat-label>
      <input
        matInput
        [formControl]="control()"
        [name]="name()"
        [type]="type()"
        [attr.autocomplete]="autocomplete()"
        [attr.maxlength]="maxlength()"
        [attr.data-testid]="testid()"
        required
      />
      @if (hint(); as text) {
        <mat-hint>{{ text }}</mat-hint>
      }
      <mat-error>{{ message() }}</mat-error>
    </mat-form-field>
  `,
  styles: `:host { display: block; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FormField {
  readonly control = input.required<FormControl<string>>();
  readonly label = input.required<string>();
  readonly name = input.required<string>();
  readonly type = input<'text' | 'email' | 'password'>('text');
  readonly autocomplete = input<string | null>(null);
  readonly hint = input<string | null>(null);
  readonly maxlength = input<number | null>(null);
  readonly testid = input<string | null>(null);
  /** The sentence when the field is empty or invalid and nothing more precise is known. */
  readonly missing = input.required<string>();

  /** Each change of the control's state (value, status, touched, errors set by the page), as a signal. */
  private readonly state = toSignal(toObservable(this.control).pipe(switchMap((c) => c.events.pipe(startWith(null)))));
  protected readonly message = computed(() => (this.state(), fieldMessage(this.control(), this.missing())));
}
