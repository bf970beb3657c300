import { Component } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { FormField } from './form-field';
import { applySchemaIssues } from './schema-errors';

@Component({
  imports: [ReactiveFormsModule, FormField],
  template: `
    <form [formGroup]="form">
      <app-form-field [control]="form.controls.email" label="E-mail" name="email" type="email" autocomplete="username" testid="the-email" missing="Enter your e-mail address." />
      <app-form-field [control]="form.controls.password" label="Password" name="password" type="password" hint="At least 10 characters." missing="Enter a password." />
    </form>
  `,
})
class Host {
  readonly form = TestBed.inject(NonNullableFormBuilder).group({
    email: ['', Validators.required],
    password: ['', Validators.required],
  });
}

describe('FormField', () => {
  async function render() {
    const fixture = TestBed.createComponent(Host);
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  it('draws a labelled input bound to the form control, with its name, type and hint', async () => {
    const { fixture, el } = await render();
    const [email, password] = [...el.querySelectorAll('input')];
    expect(email.name).toBe('email');
    expect(email.type).toBe('email');
    expect(email.getAttribute('autocomplete')).toBe('username');
    expect(email.dataset['testid']).toBe('the-email');
    expect(password.type).toBe('password');
    expect(el.textContent).toContain('E-mail');
    expect(el.textContent).toContain('At least 10 characters.');
    email.value = 'noor@lab.test';
    email.dispatchEvent(new Event('input'));
    await fixture.whenStable();
    expect(fixture.componentInstance.form.controls.email.value).toBe('noor@lab.test');
  });

  it('shows the fallback sentence for an empty field, and the schema sentence when there is one', async () => {
    const { fixture, el } = await render();
    fixture.componentInstance.form.markAllAsTouched();
    fixture.componentInstance.form.controls.email.updateValueAndValidity();
    fixture.componentInstance.form.controls.password.updateValueAndValidity();
    await fixture.whenStable();
    expect(el.textContent).toContain('Enter your e-mail address.');
    applySchemaIssues(fixture.componentInstance.form, [{ path: ['password'], message: 'The password is too short.' }]);
    await fixture.whenStable();
    expect(el.textContent).toContain('The password is too short.');
  });
});
