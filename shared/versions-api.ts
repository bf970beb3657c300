/**
 * Drafts, checkpoints and milestones: the contract between the worksheet page and
 * /api/worksheets/:id/{draft,head,versions}. Autosave keeps a draft (one per worksheet
 * and person, in PostgreSQL); a version is a checkpoint.
 */
import { z } from 'zod';
import { LIMITS, saveWorksheetBody, type WorksheetVersionDto } from './api.js';

export const VERSION_NAME_LENGTH = 120;
/** An automatic version is made at most once per this many minutes of editing. */
export const AUTO_VERSION_MINUTES = 10;
/** How often an open worksheet asks for its latest version number (and at once when the window comes back). */
export const HEAD_POLL_MS = 5000;

const versionName = z.string().trim().max(VERSION_NAME_LENGTH, `Use a name of at most ${VERSION_NAME_LENGTH} characters.`);

/** An explicit save (a checkpoint): the usual save body with an optional name. */
export const checkpointBody = saveWorksheetBody.extend({
  name: versionName.optional(),
  /** Set when the text is an older version brought back. */
  restoredFrom: z.number().int().min(1).optional(),
});
export type CheckpointBody = z.infer<typeof checkpointBody>;

/** The caller's draft: the text being typed, on top of the version it started from. */
export const draftBody = z.object({
  title: z.string().trim().min(1, 'Enter a title.').max(LIMITS.worksheetTitleLength),
  source: z.string(),
  baseVersion: z.number().int().min(1),
});
export type DraftBody = z.infer<typeof draftBody>;

export const milestoneBody = z.object({ name: versionName.optional() });

export type VersionKind = 'created' | 'saved' | 'auto' | 'restored';

export interface VersionDto extends WorksheetVersionDto {
  name: string | null;
  kind: VersionKind;
  milestone: { at: string; by: string } | null;
}

export interface DraftDto {
  title: string;
  source: string;
  baseVersion: number;
  startedAt: string;
  updatedAt: string;
}

/** The latest version's number and who made it: what an open window polls. */
export interface HeadDto {
  version: number;
  title: string;
  updatedAt: string;
  updatedBy: string;
}

/** Whether a version can be signed off: each result and its review state in that version. */
export interface MilestoneCheckDto {
  version: number;
  ready: boolean;
  results: { key: string; line: number; status: 'unreviewed' | 'requested' | 'confirmed' | 'disputed' }[];
}
