/** Request schemas and response types of invitations, password reset and the outbox. */
import { z } from 'zod';
import { GROUP_ROLES, LIMITS, type GroupRole } from './api.js';

const email = z.string().trim().toLowerCase().max(LIMITS.emailLength).email('Enter a valid e-mail address.');
const password = z
  .string()
  .min(LIMITS.passwordMin, `Use a password of at least ${LIMITS.passwordMin} characters.`)
  .max(LIMITS.passwordMax, `Use a password of at most ${LIMITS.passwordMax} characters.`);

export const INVITATION_DAYS = 7;
export const RESET_MINUTES = 60;

export const inviteBody = z.object({ email, role: z.enum(GROUP_ROLES) });
export type InviteBody = z.infer<typeof inviteBody>;

/**
 * Accepting an invitation: signed in, nothing else is needed; otherwise a new
 * account (displayName + password) or the existing account's password.
 */
export const acceptInvitationBody = z.object({
  displayName: z.string().trim().min(1).max(LIMITS.displayNameLength).optional(),
  password: z.string().max(LIMITS.passwordMax).optional(),
});
export type AcceptInvitationBody = z.infer<typeof acceptInvitationBody>;

export const resetRequestBody = z.object({ email });
export const resetConfirmBody = z.object({ token: z.string().min(10).max(200), password });

export interface InvitationDto {
  id: number;
  email: string;
  role: GroupRole;
  invitedBy: string;
  createdAt: string;
  expiresAt: string;
}

/** What the invitation page shows before anyone signs in. */
export interface InvitationPreviewDto {
  groupName: string;
  email: string;
  role: GroupRole;
  invitedBy: string;
  expiresAt: string;
  /** Whether an account with the invited address exists: sign in rather than sign up. */
  accountExists: boolean;
}

export interface OutboxMessageDto {
  id: number;
  to: string;
  subject: string;
  text: string;
  html: string;
  sentAt: string;
}

export interface MailDeliveryDto {
  id: number;
  to: string;
  subject: string;
  status: 'pending' | 'sent' | 'failed';
  attempts: number;
  lastError: string | null;
  createdAt: string;
}

// ---- review and sign-off ----

export const REVIEW_STATUSES = ['unreviewed', 'requested', 'confirmed', 'disputed'] as const;
export type ReviewStatus = (typeof REVIEW_STATUSES)[number];

export const requestReviewBody = z.object({
  statementKey: z.string().min(1).max(20_000),
  reviewerIds: z.array(z.number().int().positive()).min(1, 'Choose at least one reviewer.').max(20),
});
export const verdictBody = z.object({
  verdict: z.enum(['confirmed', 'disputed']),
  comment: z.string().trim().max(10_000).optional().default(''),
});
export const commentBody = z.object({ body: z.string().trim().min(1, 'Write a comment.').max(10_000) });

export interface ReviewCommentDto {
  id: number;
  author: string;
  body: string;
  createdAt: string;
}

export interface ReviewDto {
  id: number;
  worksheetId: number;
  worksheetTitle: string;
  statementKey: string;
  statementText: string;
  version: number;
  status: Exclude<ReviewStatus, 'unreviewed'>;
  reviewer: string;
  reviewerId: number | null;
  requestedBy: string;
  requestedAt: string;
  decidedAt: string | null;
  /** The statement, or something it depends on, changed since this review's version. */
  stale: boolean;
  comments: ReviewCommentDto[];
}

/** A statement of the current version with its review state. */
export interface StatementReviewDto {
  key: string;
  line: number;
  text: string;
  /** From the newest review whose fingerprint matches the current statement; 'unreviewed' when none. */
  status: ReviewStatus;
  reviews: ReviewDto[];
}
