import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { GroupRole, MemberDto } from '@shared/api';
import { GroupMembers } from './group-members';

const members: MemberDto[] = [
  { userId: 1, email: 'owner@demo.sheetwise.test', displayName: 'Oda Owner', role: 'owner' },
  { userId: 2, email: 'reader@demo.sheetwise.test', displayName: 'Rin Reader', role: 'reader' },
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

  async function open(role: GroupRole): Promise<{ fixture: ComponentFixture<GroupMembers>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(GroupMembers);
    fixture.componentRef.setInput('groupId', 5);
    fixture.componentRef.setInput('role', role);
    fixture.componentRef.setInput('currentUserId', 1);
    await fixture.whenStable();
    http.expectOne('/api/groups/5/members').flush({ members });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  it('shows members read-only to a non-owner', async () => {
    const { el } = await open('author');
    expect(el.querySelectorAll('[data-testid="member-row"]').length).toBe(2);
    expect(el.querySelector('[data-testid="member-role"]')).toBeNull();
    expect(el.querySelector('[data-testid="add-member-form"]')).toBeNull();
    expect(el.querySelector('[data-testid="remove-member"]')).toBeNull();
  });

  it('lets the owner add a member by e-mail with a role', async () => {
    const { fixture, el } = await open('owner');
    expect(el.querySelectorAll('[data-testid="member-role"]').length).toBe(2);
    const email = el.querySelector<HTMLInputElement>('input[name="memberEmail"]')!;
    email.value = 'Reviewer@Demo.Sheetwise.test';
    email.dispatchEvent(new Event('input'));
    el.querySelector<HTMLButtonElement>('[data-testid="add-member"]')!.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/groups/5/members');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'reviewer@demo.sheetwise.test', role: 'author' });
    req.flush(
      { member: { userId: 3, email: 'reviewer@demo.sheetwise.test', displayName: 'Rae', role: 'author' } },
      { status: 201, statusText: 'Created' },
    );
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="member-row"]').length).toBe(3);
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
});
