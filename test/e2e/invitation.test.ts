// End to end in Debian's Chromium: the mail-based flows. An owner invites a new address
// from the members tab; the mail arrives in the outbox; the link signs the person up into
// the group once, and says so the second time. A forgotten password is reset by mail, and
// a locked account is unlocked by mail.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;
let admin: ApiClient;

before(async () => {
  // A high per-address rate limit, so that the account lock is what stops the guessing below.
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser', LOGIN_RATE_LIMIT: '100' });
  browser = await launchBrowser();
  admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

interface Mail {
  to: string;
  subject: string;
  text: string;
  html: string;
}

/** The newest captured mail to an address whose subject matches, after the queue has been delivered. */
async function mailTo(address: string, subject: RegExp): Promise<Mail> {
  for (let n = 0; n < 40; n++) {
    await server.running.mailer.flush();
    const outbox = await admin.get('/api/admin/outbox');
    assert.equal(outbox.status, 200);
    const found = (outbox.json.messages as Mail[]).find((m) => m.to === address && subject.test(m.subject));
    if (found) return found;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${address} arrived`);
}

/** The link of a mail's text part to a path of this server. */
function linkIn(mail: Mail, path: string): string {
  const match = new RegExp(`${server.url.replace(/[.]/g, '\\.')}/${path}/[A-Za-z0-9_-]+`).exec(mail.text);
  assert.ok(match, `the mail has a ${path} link: ${mail.text}`);
  return match[0];
}

async function openMembersTab(page: Page): Promise<number> {
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.waitForURL(/\/groups\/\d+/);
  const groupId = Number(/\/groups\/(\d+)/.exec(page.url())![1]);
  await page.getByRole('tab', { name: 'Members' }).click();
  await page.getByTestId('member-table').waitFor();
  return groupId;
}

test('the owner invites a new address as reviewer; the link signs the person up into the group once', async () => {
  const invited = 'new.colleague@lab.test';
  const ownerContext = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const ownerPage = await ownerContext.newPage();
  await signIn(ownerPage, server.url, DEMO.owner);
  const groupId = await openMembersTab(ownerPage);

  // Someone in the group already: the 409's sentence shows beside the form.
  await ownerPage.getByTestId('invite-email').fill(DEMO.reader);
  await ownerPage.getByTestId('invite-submit').click();
  await ownerPage.getByTestId('invite-error').filter({ hasText: 'is a member of this group already' }).waitFor();

  await ownerPage.getByTestId('invite-email').fill(invited);
  await ownerPage.getByTestId('invite-role').click();
  await ownerPage.getByRole('option', { name: /^reviewer/ }).click();
  await ownerPage.getByTestId('invite-submit').click();
  const pending = ownerPage.getByTestId('pending-invitation').filter({ hasText: invited });
  await pending.waitFor();
  assert.match((await pending.textContent()) ?? '', /reviewer/);
  assert.equal(await ownerPage.getByTestId('invite-error').count(), 0, 'the earlier refusal is gone');
  await screenshot(ownerPage, 'members-invite');

  // The admin reads the mail on the Outbox screen.
  const mail = await mailTo(invited, /invites you to Lindqvist Lab/);
  const link = linkIn(mail, 'invitations');
  const adminContext = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const adminPage = await adminContext.newPage();
  await signIn(adminPage, server.url, DEMO.admin);
  await adminPage.getByTestId('account-menu').click();
  await adminPage.getByTestId('admin-outbox-link').click();
  await adminPage.waitForURL(/\/admin\/outbox$/);
  const row = adminPage.getByTestId('outbox-row').filter({ hasText: invited });
  await row.click();
  await adminPage.getByTestId('outbox-text').filter({ hasText: link }).waitFor();
  const frame = adminPage.getByTestId('outbox-html');
  assert.equal(await frame.getAttribute('sandbox'), '', 'the HTML part renders in a fully sandboxed frame');
  assert.ok((await frame.getAttribute('srcdoc'))?.includes(`href="${link}"`), 'the HTML part carries the same link');
  await adminPage.frameLocator('[data-testid="outbox-html"]').getByRole('link', { name: 'Accept the invitation' }).waitFor();
  await screenshot(adminPage, 'admin-outbox');
  await adminPage.getByRole('tab', { name: /Delivery/ }).click();
  const delivery = adminPage.getByTestId('delivery-row').filter({ hasText: invited });
  await delivery.waitFor();
  assert.match(await delivery.getByTestId('delivery-status').innerText(), /Sent/);
  await screenshot(adminPage, 'admin-delivery');
  await adminContext.close();

  // The invited person, in a browser of their own, signs up with the link.
  const guestContext = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const guest = await guestContext.newPage();
  await guest.goto(link);
  await guest.getByRole('heading', { name: 'Join Lindqvist Lab' }).waitFor();
  assert.equal((await guest.getByTestId('invitation-role').textContent())?.trim(), 'reviewer');
  assert.match(await guest.getByTestId('invitation-facts').innerText(), new RegExp(invited.replace(/[.]/g, '\\.')));
  await guest.getByTestId('invitation-display-name').fill('Nova Colleague');
  await guest.getByTestId('invitation-password').fill('short');
  await guest.getByTestId('accept-invitation').click();
  await guest.getByText(`Use a password of at least ${LIMITS.passwordMin} characters.`).waitFor();
  await screenshot(guest, 'invitation-sign-up');
  await guest.getByTestId('invitation-password').fill('a-good-long-password');
  await guest.getByTestId('accept-invitation').click();
  await guest.waitForURL(new RegExp(`/groups/${groupId}$`));
  assert.equal((await guest.getByTestId('group-role').textContent())?.trim(), 'reviewer');
  await guest.getByTestId('account-menu').filter({ hasText: 'Nova Colleague' }).waitFor();
  await screenshot(guest, 'invitation-joined');
  await guestContext.close();

  // The same link a second time, anywhere: it was used.
  const laterContext = await browser.newContext();
  const later = await laterContext.newPage();
  await later.goto(link);
  await later.getByTestId('invitation-gone').filter({ hasText: 'used already' }).waitFor();
  await later.getByRole('heading', { name: 'This invitation was used' }).waitFor();
  assert.equal(await later.getByTestId('accept-invitation').count(), 0);
  await screenshot(later, 'invitation-used');
  await laterContext.close();

  // The owner sees the new member, and the invitation is no longer pending.
  await ownerPage.reload();
  await ownerPage.getByRole('tab', { name: 'Members' }).click();
  await ownerPage.getByTestId('member-row').filter({ hasText: 'Nova Colleague' }).waitFor();
  assert.equal(await ownerPage.getByTestId('pending-invitation').filter({ hasText: invited }).count(), 0);
  await ownerContext.close();
});

test('the Outbox makes failed mail visible, in either theme', async () => {
  // A mail that could not be delivered: the state the queue leaves after its last attempt.
  await new ApiClient(server.url).post('/api/auth/password-reset', { email: DEMO.owner });
  await mailTo(DEMO.owner, /Reset your Sheetwise password/);
  await server.running.sequelize.query(
    `UPDATE mail_messages SET status = 'failed', attempts = 6, last_error = '550 5.1.1 <owner@demo.sheetwise.test>: mailbox unavailable' WHERE to_address = $1`,
    { bind: [DEMO.owner] },
  );
  const context = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.admin);
  await page.goto(`${server.url}/admin/outbox`);
  await page.getByTestId('delivery-failures').filter({ hasText: '1 mail could not be delivered' }).waitFor();
  await page.getByRole('tab', { name: /Delivery/ }).click();
  const failed = page.getByTestId('delivery-row').filter({ hasText: DEMO.owner });
  assert.match(await failed.getByTestId('delivery-status').innerText(), /error\s*Failed/);
  assert.match(await failed.innerText(), /mailbox unavailable/);
  await screenshot(page, 'admin-delivery-failed');
  const toggle = page.getByTestId('theme-toggle');
  if (await toggle.count()) {
    await toggle.click();
    await page.getByRole('tab', { name: /Messages/ }).click();
    await page.getByTestId('outbox-row').first().click();
    await screenshot(page, 'admin-outbox-dark');
  }
  await context.close();
});

test('the owner withdraws an invitation; its link then says so', async () => {
  const invited = 'withdrawn@lab.test';
  const context = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.owner);
  await openMembersTab(page);
  await page.getByTestId('invite-email').fill(invited);
  await page.getByTestId('invite-submit').click();
  const row = page.getByTestId('pending-invitation').filter({ hasText: invited });
  await row.getByTestId('revoke-invitation').click();
  // The question is a Material dialog now, not the browser's confirm().
  await page.getByTestId('confirm-dialog').getByTestId('confirm-accept').click();
  await row.waitFor({ state: 'detached' });
  const link = linkIn(await mailTo(invited, /invites you/), 'invitations');
  await page.goto(link);
  await page.getByRole('heading', { name: 'This invitation was withdrawn' }).waitFor();
  await screenshot(page, 'invitation-withdrawn');
  await context.close();
});

test('an invitation opened by another signed-in account says whom it is for and offers to sign out', async () => {
  const invited = 'someone.else@lab.test';
  const owner = new ApiClient(server.url);
  await owner.login(DEMO.owner);
  const groupId = (await owner.get('/api/groups')).json.groups[0].id;
  assert.equal((await owner.post(`/api/groups/${groupId}/invitations`, { email: invited, role: 'reader' })).status, 201);
  const link = linkIn(await mailTo(invited, /invites you/), 'invitations');
  const context = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.reviewer);
  await page.getByTestId('account-menu').waitFor();
  await page.goto(link);
  await page.getByTestId('invitation-other-account').filter({ hasText: `This invitation is for ${invited}` }).waitFor();
  assert.equal(await page.getByTestId('accept-invitation').count(), 0, 'no way to accept for another address');
  await screenshot(page, 'invitation-other-account');
  await page.getByTestId('invitation-sign-out').click();
  // Signed out, the page asks for the invited address's new account.
  await page.getByTestId('invitation-display-name').waitFor();
  await context.close();
});

test('forgot password: the mailed link sets a new password, which then signs in', async () => {
  const context = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await context.newPage();
  await page.goto(`${server.url}/sign-in`);
  await screenshot(page, 'sign-in-forgot-link');
  await page.getByTestId('forgot-password-link').click();
  await page.waitForURL(/\/forgot-password$/);
  await page.fill('input[name="email"]', DEMO.reviewer);
  await page.click('button[type="submit"]');
  await page.getByTestId('reset-requested').filter({ hasText: 'If an account has this address' }).waitFor();
  await screenshot(page, 'forgot-password-sent');
  await context.close();

  // The link opens in another browser, as from a mail program: no cookie of ours yet.
  const link = linkIn(await mailTo(DEMO.reviewer, /Reset your Sheetwise password/), 'reset-password');
  const mailContext = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const reset = await mailContext.newPage();
  await reset.goto(link);
  await reset.fill('input[name="password"]', 'a-brand-new-password');
  await reset.fill('input[name="repeat"]', 'a-brand-new-passwort');
  await reset.click('button[type="submit"]');
  await reset.getByText('The two passwords differ').waitFor();
  await screenshot(reset, 'reset-password-mismatch');
  await reset.fill('input[name="repeat"]', 'a-brand-new-password');
  await reset.click('button[type="submit"]');
  await reset.getByTestId('reset-done').filter({ hasText: 'Password changed' }).waitFor();
  await screenshot(reset, 'reset-password-done');
  await reset.getByTestId('reset-sign-in').click();
  await reset.waitForURL(/\/sign-in$/);
  await signIn(reset, server.url, DEMO.reviewer, 'a-brand-new-password');
  await reset.getByTestId('account-menu').waitFor();

  // The link works once.
  const again = await mailContext.newPage();
  await again.goto(link);
  await again.fill('input[name="password"]', 'yet-another-password');
  await again.fill('input[name="repeat"]', 'yet-another-password');
  await again.click('button[type="submit"]');
  await again.getByTestId('reset-error').filter({ hasText: 'not valid any more' }).waitFor();
  await screenshot(again, 'reset-password-used');
  await mailContext.close();
});

test('a locked account is unlocked by the mailed link', async () => {
  const guesser = new ApiClient(server.url);
  for (let n = 0; n < LIMITS.failedSignInsBeforeLock; n++) {
    await guesser.post('/api/auth/login', { email: DEMO.author, password: `guess-number-${n}` });
  }
  const link = linkIn(await mailTo(DEMO.author, /locked/), 'unlock');
  const context = await browser.newContext({ viewport: { width: 1366, height: 900 } });
  const page = await context.newPage();
  await page.goto(link);
  await page.getByTestId('unlock-result').filter({ hasText: 'The account is unlocked' }).waitFor();
  await screenshot(page, 'unlock-done');
  await page.getByTestId('unlock-sign-in').click();
  await signIn(page, server.url, DEMO.author);
  await page.goto(link);
  await page.getByTestId('unlock-result').filter({ hasText: 'not valid any more' }).waitFor();
  await screenshot(page, 'unlock-used');
  await context.close();
});
