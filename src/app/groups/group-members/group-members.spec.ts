import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { GroupRole, MemberDto } from '@shared/api';
import type { InvitationDto } from '@shared/collaboration';
import { GroupMembers } from './group-members';
import { Confirmer } from '../../core/dialogs/confirmer';
import { of } from 'rxjs';

const members: MemberDto[] = [
  { userId: 1, email: 'owner@demo.sheetwise.test', displayName: 'Oda Owner', role: 'owner' },
  { userId: 2, email: 'reader@demo.sheetwise.test', displayName: 'Rin Reader', role: 'reader' },
];

const pending: InvitationDto[] = [
  {
    id: 11,
    email: 'waiting@lab.test',
    role: 'reader',
    invitedBy: 'Oda Owner',
    createdAt: '2026-03-01T10:00:00Z',
    expiresAt: '2026-03-08T10:00:00Z',
  },
];

describe('GroupMembers', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [GroupMembers],
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function open(
    role: GroupRole,
    invitations: InvitationDto[] = pending,
  ): Promise<{ fixture: ComponentFixture<GroupMembers>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(GroupMembers);
    fixture.componentRef.setInput('groupId', 5);
    fixture.componentRef.setInput('role', role);
    fixture.componentRef.setInput('currentUserId', 1);
    await fixture.whenStable();
    http.expectOne('/api/groups/5/members').flush({ members });
    // Only owners see (and so load) the pending invitations.
    if (role === 'owner') http.expectOne('/api/groups/5/invitations').flush({ invitations });
    else http.expectNone('/api/groups/5/invitations');
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  it('shows members read-only to a non-owner', async () => {
    const { el } = await open('author');
    expect(el.querySelectorAll('[data-testid="member-row"]').length).toBe(2);
    expect(el.querySelector('[data-testid="member-role"]')).toBeNull();
    expect(el.querySelector('[data-testid="add-member-form"]')).toBeNull();
    expect(el.querySelector('[data-testid="remove-member"]')).toBeNull();
    expect(el.querySelector('[data-testid="invite-email"]')).toBeNull();
    expect(el.querySelector('[data-testid="pending-invitation"]')).toBeNull();
  });

  it('has no way to add an account without an invitation', async () => {
    const { el } = await open('owner');
    expect(el.querySelectorAll('[data-testid="member-role"]').length).toBe(2);
    expect(el.querySelector('[data-testid="add-member-form"]')).toBeNull();
    expect(el.querySelector('[data-testid="invite-form"]')).not.toBeNull();
  });

  it('sends a role change as PATCH', async () => {
    const { fixture } = await open('owner');
    (fixture.componentInstance as unknown as { changeRole(m: MemberDto, r: GroupRole): void }).changeRole(
      members[1],
      'reviewer',
    );
    const req = http.expectOne('/api/groups/5/members/2');
    expect(req.request.method).toBe('PATCH');
    expect(req.request.body).toEqual({ role: 'reviewer' });
    req.flush({ member: { ...members[1], role: 'reviewer' } });
  });

  function type(el: HTMLElement, testId: string, value: string): void {
    const input = el.querySelector<HTMLInputElement>(`[data-testid="${testId}"]`)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  it('lists the pending invitations to the owner', async () => {
    const { el } = await open('owner');
    const rows = el.querySelectorAll('[data-testid="pending-invitation"]');
    expect(rows.length).toBe(1);
    expect(rows[0].textContent).toContain('waiting@lab.test');
    expect(rows[0].textContent).toContain('reader');
    expect(rows[0].textContent).toContain('8 Mar 2026');
  });

  it('says so when no invitation is pending', async () => {
    const { el } = await open('owner', []);
    expect(el.querySelector('[data-testid="pending-invitation"]')).toBeNull();
    expect(el.textContent).toContain('No invitation is waiting for an answer.');
  });

  it('invites by e-mail with a role and lists the new invitation at once', async () => {
    const { fixture, el } = await open('owner');
    type(el, 'invite-email', ' New.Person@Lab.test ');
    fixture.componentInstance['inviteForm'].controls.role.setValue('reviewer');
    el.querySelector<HTMLButtonElement>('[data-testid="invite-submit"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/groups/5/invitations');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'new.person@lab.test', role: 'reviewer' });
    req.flush(
      {
        invitation: {
          id: 12,
          email: 'new.person@lab.test',
          role: 'reviewer',
          invitedBy: 'Oda Owner',
          createdAt: '2026-03-02T10:00:00Z',
          expiresAt: '2026-03-09T10:00:00Z',
        },
      },
      { status: 201, statusText: 'Created' },
    );
    await fixture.whenStable();
    const rows = el.querySelectorAll('[data-testid="pending-invitation"]');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('new.person@lab.test');
    expect(el.querySelector<HTMLInputElement>('[data-testid="invite-email"]')!.value).toBe('');
    // The emptied field is not flagged as an error of the submit just made.
    expect(el.querySelector('[data-testid="invite-form"] mat-error')).toBeNull();
  });

  it('checks the address before sending an invitation', async () => {
    const { fixture, el } = await open('owner');
    type(el, 'invite-email', 'not-an-address');
    el.querySelector<HTMLButtonElement>('[data-testid="invite-submit"]')!.click();
    await fixture.whenStable();
    http.expectNone('/api/groups/5/invitations');
    expect(el.textContent).toContain('Enter a valid e-mail address.');
  });

  it('shows the 409 sentence when the address belongs to a member already', async () => {
    const { fixture, el } = await open('owner');
    type(el, 'invite-email', 'reader@demo.sheetwise.test');
    el.querySelector<HTMLButtonElement>('[data-testid="invite-submit"]')!.click();
    await fixture.whenStable();
    const message =
      'reader@demo.sheetwise.test is a member of this group already. Change their role in the member list instead.';
    http
      .expectOne('/api/groups/5/invitations')
      .flush({ error: { code: 'already_member', message } }, { status: 409, statusText: 'Conflict' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="invite-error"]')?.textContent).toContain(message);
    expect(el.querySelectorAll('[data-testid="pending-invitation"]').length).toBe(1);
  });

  it('withdraws an invitation with DELETE after asking', async () => {
    const confirm = vi.spyOn(TestBed.inject(Confirmer), 'ask').mockReturnValue(of(true));
    const { fixture, el } = await open('owner');
    el.querySelector<HTMLButtonElement>('[data-testid="revoke-invitation"]')!.click();
    expect(confirm).toHaveBeenCalledWith(expect.objectContaining({ message: expect.stringContaining('waiting@lab.test'), danger: true }));
    const req = http.expectOne('/api/groups/5/invitations/11');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="pending-invitation"]')).toBeNull();
    confirm.mockRestore();
  });

  it('keeps the invitation when the owner does not confirm', async () => {
    const confirm = vi.spyOn(TestBed.inject(Confirmer), 'ask').mockReturnValue(of(false));
    const { el } = await open('owner');
    el.querySelector<HTMLButtonElement>('[data-testid="revoke-invitation"]')!.click();
    http.expectNone('/api/groups/5/invitations/11');
    expect(el.querySelectorAll('[data-testid="pending-invitation"]').length).toBe(1);
    confirm.mockRestore();
  });
});
