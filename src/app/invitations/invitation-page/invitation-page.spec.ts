import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import type { UserDto } from '@shared/api';
import type { InvitationPreviewDto } from '@shared/collaboration';
import { AuthStore } from '../../core/auth/auth-store';
import { InvitationPage } from './invitation-page';

const preview: InvitationPreviewDto = {
  groupName: 'Lindqvist Lab',
  email: 'new.person@lab.test',
  role: 'reviewer',
  invitedBy: 'Maren Lindqvist',
  expiresAt: '2026-03-08T10:00:00Z',
  accountExists: false,
};
const newUser: UserDto = { id: 9, email: 'new.person@lab.test', displayName: 'New Person', siteRole: 'user', disabled: false };
const signedOut = () => [{ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' }] as const;

describe('InvitationPage', () => {
  let http: HttpTestingController;
  let navigate: ReturnType<typeof vi.spyOn>;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [InvitationPage],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    navigate = vi.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
  });

  afterEach(() => http.verify());

  /** Opens the page for token `tok-123`; `me` is the answer of /api/auth/me (null: signed out). */
  async function open(
    answer: { invitation: InvitationPreviewDto } | { status: number; code: string; message: string },
    me: UserDto | null = null,
  ): Promise<{ fixture: ComponentFixture<InvitationPage>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(InvitationPage);
    fixture.componentRef.setInput('token', 'tok-123');
    await fixture.whenStable();
    const meReq = http.expectOne('/api/auth/me');
    if (me) meReq.flush({ user: me });
    else meReq.flush(...signedOut());
    const req = http.expectOne('/api/invitations/tok-123');
    expect(req.request.method).toBe('GET');
    if ('invitation' in answer) req.flush(answer);
    else req.flush({ error: { code: answer.code, message: answer.message } }, { status: answer.status, statusText: 'Gone' });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  function type(el: HTMLElement, testId: string, value: string): void {
    const input = el.querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  it('shows the group, role, inviter and expiry, and asks a new person for a name and a password', async () => {
    const { el } = await open({ invitation: preview });
    expect(el.querySelector('h1')?.textContent).toContain('Join Lindqvist Lab');
    expect(el.textContent).toContain('Maren Lindqvist');
    expect(el.querySelector('[data-testid="invitation-role"]')?.textContent?.trim()).toBe('reviewer');
    expect(el.querySelector('[data-testid="invitation-facts"]')?.textContent).toContain('8 Mar 2026');
    expect(el.querySelector('[data-testid="invitation-display-name"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="invitation-password"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="accept-invitation"]')?.textContent).toContain('Create account and join');
  });

  it('checks the password length before sending, then signs up, refreshes the user and opens the group', async () => {
    const { fixture, el } = await open({ invitation: preview });
    type(el, 'invitation-display-name', 'New Person');
    type(el, 'invitation-password', 'short');
    el.querySelector<HTMLButtonElement>('[data-testid="accept-invitation"]')!.click();
    await fixture.whenStable();
    http.expectNone('/api/invitations/tok-123/accept');
    expect(el.textContent).toContain('Use a password of at least 12 characters.');

    type(el, 'invitation-password', 'a-long-enough-password');
    el.querySelector<HTMLButtonElement>('[data-testid="accept-invitation"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/invitations/tok-123/accept');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ displayName: 'New Person', password: 'a-long-enough-password' });
    req.flush({ user: newUser, groupId: 7 }, { status: 201, statusText: 'Created' });
    http.expectOne('/api/auth/me').flush({ user: newUser });
    await fixture.whenStable();
    expect(TestBed.inject(AuthStore).user()).toEqual(newUser);
    expect(navigate).toHaveBeenCalledWith(['/groups', 7]);
  });

  it('asks only for the password when the address has an account, and shows a wrong one in place', async () => {
    const { fixture, el } = await open({ invitation: { ...preview, accountExists: true } });
    expect(el.querySelector('[data-testid="invitation-display-name"]')).toBeNull();
    type(el, 'invitation-password', 'not-the-password');
    el.querySelector<HTMLButtonElement>('[data-testid="accept-invitation"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/invitations/tok-123/accept');
    expect(req.request.body).toEqual({ password: 'not-the-password' });
    req.flush(
      { error: { code: 'bad_credentials', message: 'Enter the password of the account new.person@lab.test to accept.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="invitation-error"]')?.textContent).toContain(
      'Enter the password of the account new.person@lab.test to accept.',
    );
    expect(navigate).not.toHaveBeenCalled();
    expect(el.querySelector('a[href="/forgot-password"]')).not.toBeNull();
  });

  it('offers a single Accept button to the invited address, signed in, and sends nothing else', async () => {
    const { fixture, el } = await open({ invitation: preview }, newUser);
    expect(el.querySelector('[data-testid="invitation-password"]')).toBeNull();
    expect(el.textContent).toContain('You are signed in as New Person');
    el.querySelector<HTMLButtonElement>('[data-testid="accept-invitation"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/invitations/tok-123/accept');
    expect(req.request.body).toEqual({});
    req.flush({ user: newUser, groupId: 7 });
    http.expectOne('/api/auth/me').flush({ user: newUser });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith(['/groups', 7]);
  });

  it('tells another signed-in account that the invitation is not theirs, and offers to sign out', async () => {
    const me: UserDto = { id: 4, email: 'someone@lab.test', displayName: 'Some One', siteRole: 'user', disabled: false };
    const { el } = await open({ invitation: preview }, me);
    const note = el.querySelector('[data-testid="invitation-other-account"]')?.textContent ?? '';
    expect(note).toContain('This invitation is for new.person@lab.test, and you are signed in as someone@lab.test.');
    expect(el.querySelector('[data-testid="accept-invitation"]')).toBeNull();
    expect(el.querySelector('[data-testid="invitation-sign-out"]')).not.toBeNull();
    http.expectNone('/api/invitations/tok-123/accept');
  });

  it.each([
    ['invitation_used', 410, 'This invitation was used already. Sign in to reach the group, or ask the owner for a new one.', 'This invitation was used'],
    ['invitation_expired', 410, 'This invitation has expired. Ask the group owner for a new one.', 'This invitation has expired'],
    ['invitation_revoked', 410, 'This invitation was withdrawn. Ask the group owner for a new one.', 'This invitation was withdrawn'],
    ['invitation_unknown', 404, 'This invitation link is not valid. Ask the group owner for a new one.', 'This invitation link is not valid'],
  ])('says plainly when the link cannot be used (%s)', async (code, status, message, heading) => {
    const { el } = await open({ status, code, message });
    expect(el.querySelector('h1')?.textContent?.trim()).toBe(heading);
    expect(el.querySelector('[data-testid="invitation-gone"]')?.textContent).toContain(message);
    expect(el.querySelector('[data-testid="accept-invitation"]')).toBeNull();
  });

  it('turns into the "used" answer when the link was used meanwhile', async () => {
    const { fixture, el } = await open({ invitation: preview });
    type(el, 'invitation-display-name', 'New Person');
    type(el, 'invitation-password', 'a-long-enough-password');
    el.querySelector<HTMLButtonElement>('[data-testid="accept-invitation"]')!.click();
    await fixture.whenStable();
    http
      .expectOne('/api/invitations/tok-123/accept')
      .flush({ error: { code: 'invitation_used', message: 'This invitation was used already.' } }, { status: 410, statusText: 'Gone' });
    await fixture.whenStable();
    expect(el.querySelector('h1')?.textContent?.trim()).toBe('This invitation was used');
    expect(el.querySelector('form')).toBeNull();
  });
});
