import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import type { MailDeliveryDto, OutboxMessageDto } from '@shared/collaboration';
import { AdminOutbox } from './admin-outbox';

const messages: OutboxMessageDto[] = [
  {
    id: 2,
    to: 'new.person@lab.test',
    subject: 'Maren Lindqvist invites you to Lindqvist Lab on Sheetwise',
    text: 'Accept the invitation: http://127.0.0.1:4300/invitations/abc',
    html: '<p>Hello,</p><p><a href="http://127.0.0.1:4300/invitations/abc">Accept the invitation</a></p><script>window.parent.pwned = true</script>',
    sentAt: '2026-03-01T10:00:00Z',
  },
  {
    id: 1,
    to: 'reader@demo.sheetwise.test',
    subject: 'Reset your Sheetwise password',
    text: 'Choose a new password: http://127.0.0.1:4300/reset-password/xyz',
    html: '<p>Choose a new password</p>',
    sentAt: '2026-03-01T09:00:00Z',
  },
];
const deliveries: MailDeliveryDto[] = [
  { id: 3, to: 'gone@lab.test', subject: 'Invitation', status: 'failed', attempts: 5, lastError: '550 mailbox unavailable', createdAt: '2026-03-01T10:05:00Z' },
  { id: 2, to: 'new.person@lab.test', subject: 'Invitation', status: 'sent', attempts: 1, lastError: null, createdAt: '2026-03-01T10:00:00Z' },
  { id: 1, to: 'slow@lab.test', subject: 'Reset', status: 'pending', attempts: 2, lastError: 'connect ECONNREFUSED', createdAt: '2026-03-01T09:00:00Z' },
];

describe('AdminOutbox', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [AdminOutbox],
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function open(): Promise<{ fixture: ComponentFixture<AdminOutbox>; el: HTMLElement }> {
    const fixture = TestBed.createComponent(AdminOutbox);
    await fixture.whenStable();
    http.expectOne('/api/admin/outbox').flush({ messages });
    http.expectOne('/api/admin/mail-deliveries').flush({ deliveries });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  const iframe = (el: HTMLElement) => el.querySelector<HTMLIFrameElement>('[data-testid="outbox-html"]')!;
  const srcdoc = (frame: HTMLIFrameElement) => frame.getAttribute('srcdoc') ?? (frame as unknown as { srcdoc?: string }).srcdoc ?? '';

  it('lists the messages and shows the newest one: text part, and HTML part in a fully sandboxed frame', async () => {
    const { el } = await open();
    const rows = el.querySelectorAll('[data-testid="outbox-row"]');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('new.person@lab.test');
    expect(rows[0].textContent).toContain('Maren Lindqvist invites you');
    expect(rows[0].classList).toContain('selected');
    expect(el.querySelector('[data-testid="outbox-text"]')?.textContent).toContain('/invitations/abc');
    const frame = iframe(el);
    expect(frame.getAttribute('sandbox')).toBe('');
    expect(srcdoc(frame)).toContain('<a href="http://127.0.0.1:4300/invitations/abc">Accept the invitation</a>');
    // The mail's markup lives only inside the frame, never in this document.
    expect(el.querySelector('script')).toBeNull();
    expect(el.querySelector('[data-testid="outbox-message"] a')).toBeNull();
  });

  it('shows another message when its row is picked', async () => {
    const { fixture, el } = await open();
    el.querySelectorAll<HTMLElement>('[data-testid="outbox-row"]')[1].click();
    await fixture.whenStable();
    expect(el.querySelector('#message-subject')?.textContent).toBe('Reset your Sheetwise password');
    expect(el.querySelector('[data-testid="outbox-text"]')?.textContent).toContain('/reset-password/xyz');
    expect(srcdoc(iframe(el))).toBe('<p>Choose a new password</p>');
  });

  it('makes failed mail visible: a banner, and a status with icon and word, attempts and the last error', async () => {
    const { fixture, el } = await open();
    expect(el.querySelector('[data-testid="delivery-failures"]')?.textContent).toContain('1 mail could not be delivered');
    const tab = [...el.querySelectorAll<HTMLElement>('[role="tab"]')].find((t) => t.textContent?.includes('Delivery'))!;
    expect(tab.textContent).toContain('1 failed');
    tab.click();
    await fixture.whenStable();
    const rows = [...el.querySelectorAll<HTMLElement>('[data-testid="delivery-row"]')];
    expect(rows.length).toBe(3);
    const status = rows.map((r) => r.querySelector('[data-testid="delivery-status"]')!.textContent!.replace(/\s+/g, ' ').trim());
    expect(status).toEqual(['error Failed', 'check_circle Sent', 'schedule Pending']);
    expect(rows[0].classList).toContain('failed');
    expect(rows[0].textContent).toContain('550 mailbox unavailable');
    expect(rows[0].textContent).toContain('5');
    expect(rows[1].textContent).toContain('none');
  });

  it('shows the server sentence when the lists cannot be loaded, with a retry', async () => {
    const fixture = TestBed.createComponent(AdminOutbox);
    await fixture.whenStable();
    const outbox = http.expectOne('/api/admin/outbox');
    const other = http.expectOne('/api/admin/mail-deliveries');
    outbox.flush(
      { error: { code: 'forbidden', message: 'Only site admins may do this.' } },
      { status: 403, statusText: 'Forbidden' },
    );
    expect(other.cancelled).toBe(true);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    expect(el.querySelector('[role="alert"]')?.textContent).toContain('Only site admins may do this.');
    [...el.querySelectorAll('button')].find((b) => b.textContent?.includes('Try again'))!.click();
    http.expectOne('/api/admin/outbox').flush({ messages });
    http.expectOne('/api/admin/mail-deliveries').flush({ deliveries });
    await fixture.whenStable();
    expect(el.querySelectorAll('[data-testid="outbox-row"]').length).toBe(2);
  });
});
