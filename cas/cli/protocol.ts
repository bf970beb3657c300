/** Messages between the command line's main thread (main.ts) and its evaluation threads (worker.ts). Types only. */
import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';

export interface CliJob {
  id: number;
  file: string;
  source: string;
  /** Per-statement time limit in ms; 0 means none. */
  limitMs: number;
  /** Whether to send each statement's readable text too (not for --json). */
  text: boolean;
}

/** Sent by the build (scripts/build-cli.mjs) after its warm-up jobs: write the code cache (builtWorker.ts). */
export interface SaveCodeCache { type: 'save-code-cache' }

export type CliMessage =
  | { type: 'parsed'; id: number; engine: string; total: number }
  | { type: 'start'; id: number; index: number; line: number }
  | { type: 'statement'; id: number; index: number; report: StatementReport; text: string }
  | { type: 'done'; id: number; report: WorksheetReport }
  | { type: 'failed'; id: number; message: string }
  | { type: 'code-cache-saved'; bytes: number };
