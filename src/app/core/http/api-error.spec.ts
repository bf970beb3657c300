import { HttpErrorResponse } from '@angular/common/http';
import { apiErrorDetails, apiErrorMessage, versionConflict } from './api-error';

describe('apiErrorMessage', () => {
  it('uses the server sentence when there is one', () => {
    const err = new HttpErrorResponse({
      status: 403,
      error: { error: { code: 'forbidden', message: 'Only authors can edit this worksheet.' } },
    });
    expect(apiErrorMessage(err)).toBe('Only authors can edit this worksheet.');
  });

  it('says plainly when the server cannot be reached', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 0 }))).toMatch(/could not be reached/);
  });

  it('has a plain sentence for a rate limit without a body', () => {
    expect(apiErrorMessage(new HttpErrorResponse({ status: 429, error: 'Too Many' }))).toMatch(/Too many attempts/);
  });

  it('collects field details of a 400', () => {
    const err = new HttpErrorResponse({
      status: 400,
      error: {
        error: { code: 'invalid', message: 'Check the form.', details: [{ path: 'email', message: 'Bad e-mail.' }] },
      },
    });
    expect(apiErrorDetails(err)).toEqual({ email: 'Bad e-mail.' });
  });

  it('recognises a 409 version conflict only when it carries the current version', () => {
    const current = { id: 1, version: 4 };
    expect(
      versionConflict(new HttpErrorResponse({ status: 409, error: { error: { code: 'c', message: 'm' }, current } })),
    ).toMatchObject({ current });
    expect(versionConflict(new HttpErrorResponse({ status: 409, error: { error: { code: 'c', message: 'm' } } }))).toBeNull();
    expect(versionConflict(new HttpErrorResponse({ status: 400 }))).toBeNull();
  });
});
