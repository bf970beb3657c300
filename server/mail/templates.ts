import type { MailContent } from './mailer.js';

const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

/** A plain, short mail: a greeting line, one sentence, the link, a closing line. */
function compose(to: string, subject: string, lines: string[], link: { href: string; label: string }): MailContent {
  const text = `${lines.join('\n\n')}\n\n${link.label}: ${link.href}\n\n— Sheetwise\n`;
  const html = `<div style="font-family:sans-serif;font-size:15px;line-height:1.5;color:#1b2430">${lines
    .map((l) => `<p>${escape(l)}</p>`)
    .join('')}<p><a href="${escape(link.href)}">${escape(link.label)}</a></p><p style="color:#5b6675">— Sheetwise</p></div>`;
  return { to, subject, text, html };
}

export function invitationMail(o: { to: string; groupName: string; role: string; inviter: string; link: string; days: number }): MailContent {
  return compose(
    o.to,
    `${o.inviter} invites you to ${o.groupName} on Sheetwise`,
    [`Hello,`, `${o.inviter} invites you to join the group “${o.groupName}” on Sheetwise as ${o.role}. The link works once and for ${o.days} days.`],
    { href: o.link, label: 'Accept the invitation' },
  );
}

export function passwordResetMail(o: { to: string; link: string; minutes: number }): MailContent {
  return compose(
    o.to,
    'Reset your Sheetwise password',
    [`Hello,`, `Someone asked to reset the password of this Sheetwise account. If it was you, choose a new password within ${o.minutes} minutes; if not, ignore this mail.`],
    { href: o.link, label: 'Choose a new password' },
  );
}

export function unlockMail(o: { to: string; link: string; failures: number }): MailContent {
  return compose(
    o.to,
    'Your Sheetwise account was locked',
    [`Hello,`, `After ${o.failures} failed sign-ins in a row, this Sheetwise account is locked. If you tried to sign in, unlock it with the link below; if not, unlock it and then change your password.`],
    { href: o.link, label: 'Unlock the account' },
  );
}

export function reviewRequestedMail(o: { to: string; requester: string; worksheet: string; statement: string; link: string }): MailContent {
  return compose(
    o.to,
    `Review requested: ${o.statement} in “${o.worksheet}”`,
    [`Hello,`, `${o.requester} asks you to review the result “${o.statement}” in the worksheet “${o.worksheet}”. Confirm it or dispute it with a comment.`],
    { href: o.link, label: 'Open the worksheet' },
  );
}

export function reviewVerdictMail(o: { to: string; reviewer: string; verdict: string; worksheet: string; statement: string; comment: string; link: string }): MailContent {
  return compose(
    o.to,
    `${o.reviewer} ${o.verdict} ${o.statement} in “${o.worksheet}”`,
    [`Hello,`, `${o.reviewer} ${o.verdict} the result “${o.statement}” in the worksheet “${o.worksheet}”.`, ...(o.comment ? [`Comment: ${o.comment}`] : [])],
    { href: o.link, label: 'Open the worksheet' },
  );
}

export function reviewReplyMail(o: { to: string; author: string; worksheet: string; statement: string; body: string; link: string }): MailContent {
  return compose(
    o.to,
    `New comment on ${o.statement} in “${o.worksheet}”`,
    [`Hello,`, `${o.author} replied in the review thread of “${o.statement}” in “${o.worksheet}”:`, o.body],
    { href: o.link, label: 'Open the thread' },
  );
}
