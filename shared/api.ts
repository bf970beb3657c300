/**
 * The JSON contract between the Angular client and the Express API.
 * Request bodies are zod schemas (validated on the server, reused by the client
 * for its own form checks); responses are plain types.
 * shared/ imports nothing from src/, server/ or cas/.
 */
import { z } from 'zod';
import { LANGUAGE_LIMITS } from './language.js';

export const SITE_ROLES = ['user', 'admin'] as const;
export type SiteRole = (typeof SITE_ROLES)[number];

/** Member roles, strongest first. */
export const GROUP_ROLES = ['owner', 'author', 'reviewer', 'reader'] as const;
export type GroupRole = (typeof GROUP_ROLES)[number];

export const LIMITS = {
  emailLength: 254,
  displayNameLength: 80,
  passwordMin: 12,
  passwordMax: 200,
  groupNameLength: 120,
  worksheetTitleLength: 200,
  searchLength: 200,
  pageSizeMax: 100,
  /** Evaluation limits, checked before any computation starts. */
  worksheetBytes: 200 * 1024,
  /** The client's check before saving (characters; the server counts UTF-8 bytes). */
  worksheetSourceLength: 200 * 1024,
  /** The language's own limits (statements, length, depth, variables): one source for server and core. */
  ...LANGUAGE_LIMITS,
  /** Consecutive failed sign-ins after which an account is locked until unlocked by e-mail. */
  failedSignInsBeforeLock: 10,
} as const;

const email = z.string().trim().toLowerCase().max(LIMITS.emailLength).email('Enter a valid e-mail address.');
const password = z
  .string()
  .min(LIMITS.passwordMin, `Use a password of at least ${LIMITS.passwordMin} characters.`)
  .max(LIMITS.passwordMax, `Use a password of at most ${LIMITS.passwordMax} characters.`);

export const registerBody = z.object({
  email,
  displayName: z.string().trim().min(1, 'Enter a display name.').max(LIMITS.displayNameLength),
  password,
});
export type RegisterBody = z.infer<typeof registerBody>;

export const loginBody = z.object({
  email,
  password: z.string().min(1, 'Enter your password.').max(LIMITS.passwordMax),
});
export type LoginBody = z.infer<typeof loginBody>;

export const groupBody = z.object({
  name: z.string().trim().min(1, 'Enter a group name.').max(LIMITS.groupNameLength),
});
export type GroupBody = z.infer<typeof groupBody>;

export const addMemberBody = z.object({ email, role: z.enum(GROUP_ROLES) });
export type AddMemberBody = z.infer<typeof addMemberBody>;

export const changeMemberBody = z.object({ role: z.enum(GROUP_ROLES) });
export type ChangeMemberBody = z.infer<typeof changeMemberBody>;

export const WORKSHEET_SORT_FIELDS = ['title', 'updatedAt', 'version'] as const;
export type WorksheetSortField = (typeof WORKSHEET_SORT_FIELDS)[number];

export const worksheetListQuery = z.object({
  search: z.string().max(LIMITS.searchLength).optional().default(''),
  sort: z.enum(WORKSHEET_SORT_FIELDS).optional().default('updatedAt'),
  direction: z.enum(['asc', 'desc']).optional().default('desc'),
  page: z.coerce.number().int().min(0).optional().default(0),
  pageSize: z.coerce.number().int().min(1).max(LIMITS.pageSizeMax).optional().default(10),
});
export type WorksheetListQuery = z.infer<typeof worksheetListQuery>;

export const createWorksheetBody = z.object({
  title: z.string().trim().min(1, 'Enter a title.').max(LIMITS.worksheetTitleLength),
  source: z.string().optional().default(''),
});
export type CreateWorksheetBody = z.infer<typeof createWorksheetBody>;

/** A save names the version it was based on; a stale base gets 409. */
export const saveWorksheetBody = z.object({
  title: z.string().trim().min(1, 'Enter a title.').max(LIMITS.worksheetTitleLength).optional(),
  source: z.string(),
  baseVersion: z.number().int().min(1),
});
export type SaveWorksheetBody = z.infer<typeof saveWorksheetBody>;

export const evaluateBody = z.object({ source: z.string() });
export type EvaluateBody = z.infer<typeof evaluateBody>;

export const adminUserPatchBody = z.object({ disabled: z.boolean() });

// ---- responses ----

export interface UserDto {
  id: number;
  email: string;
  displayName: string;
  siteRole: SiteRole;
  disabled: boolean;
}

export interface GroupSummaryDto {
  id: number;
  name: string;
  /** The signed-in user's role in this group. */
  role: GroupRole;
  memberCount: number;
  worksheetCount: number;
}

export interface MemberDto {
  userId: number;
  email: string;
  displayName: string;
  role: GroupRole;
}

export interface WorksheetSummaryDto {
  id: number;
  title: string;
  version: number;
  updatedAt: string;
  updatedBy: string;
}

export interface WorksheetDto extends WorksheetSummaryDto {
  groupId: number;
  source: string;
  /** The signed-in user's role in the worksheet's group. */
  role: GroupRole;
}

export interface WorksheetVersionDto {
  number: number;
  title: string;
  source: string;
  authorName: string;
  createdAt: string;
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export interface ApiErrorBody {
  error: { code: string; message: string; details?: { path: string; message: string }[] };
}

/** 409 on a stale save: the error plus the version now on the server. */
export interface VersionConflictBody extends ApiErrorBody {
  current: WorksheetDto;
}

/** What each role may do; the server enforces it, the client hides controls by it. */
export const ROLE_CAN = {
  manageMembers: ['owner'],
  manageGroup: ['owner'],
  editWorksheets: ['owner', 'author'],
  review: ['owner', 'reviewer'],
  read: ['owner', 'author', 'reviewer', 'reader'],
} as const satisfies Record<string, readonly GroupRole[]>;
export type Ability = keyof typeof ROLE_CAN;

export function roleCan(role: GroupRole | null | undefined, ability: Ability): boolean {
  return role != null && (ROLE_CAN[ability] as readonly GroupRole[]).includes(role);
}
