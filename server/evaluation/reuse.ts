/**
 * Incremental evaluation: which statements of a worksheet can keep a record made by an
 * earlier evaluation. Each statement gets a key that covers everything its record can
 * depend on, so a record found under the same key is the one a fresh run would make:
 *
 * - the engine version and the per-statement time limit;
 * - the statement's own lines of text, where they stand (line numbers and columns are
 *   in the record and in the messages of later statements);
 * - every param statement before it (the core lists parameters in declaration order
 *   and `limit` reads every declared domain);
 * - for every name the statement defines or uses (statementNames), the keys of all
 *   earlier statements that define or use that name (a redefinition, a `continue` or a
 *   `rotate` of it included), recursively.
 *
 * Only records with status "ok" are kept for reuse: an error may come from the time
 * limit, the budget or a size cap, which a fresh run need not meet again. A line that
 * does not parse has no key (it costs nothing to report again).
 *
 * The keys are made in the worker from its parse (nothing proportional to the worksheet
 * runs on the server's event loop); the pool keeps each owner's recent records by key
 * (ReuseCache) and hands them to the worker with the job.
 */
import { createHash } from 'node:crypto';
import { ENGINE_VERSION, statementNames, type ParsedWorksheet } from '../../cas/index.js';

const sha = (s: string) => createHash('sha256').update(s).digest('base64url');

/** One key per entry of `parsed.lines` (null for a line that does not parse). */
export function reuseKeys(source: string, parsed: ParsedWorksheet, timeLimitMs: number): (string | null)[] {
  const lines = source.split(/\r?\n/);
  const keys: (string | null)[] = [];
  /** Per name, the keys of the statements so far that define or use it. */
  const touching = new Map<string, string[]>();
  const params: string[] = [];
  for (const entry of parsed.lines) {
    if (!entry.ok) {
      keys.push(null);
      continue;
    }
    const s = entry.statement;
    const names = statementNames(s);
    const all = [...new Set([...names.defined, ...names.used])].sort();
    const text = lines.slice(s.span.start.line - 1, s.span.end.line).join('\n');
    const parts = [
      ENGINE_VERSION,
      String(timeLimitMs),
      `${s.kind}@${s.span.start.line}:${s.span.start.column}-${s.span.end.line}:${s.span.end.column}`,
      text,
      `params ${params.join(',')}`,
      ...all.map((n) => `${n}: ${(touching.get(n) ?? []).join(',')}`),
    ];
    const key = sha(parts.join('\n'));
    keys.push(key);
    for (const n of all) {
      const list = touching.get(n);
      if (list) list.push(key);
      else touching.set(n, [key]);
    }
    if (s.kind === 'param') params.push(key);
  }
  return keys;
}

/**
 * Recent statement records (JSON) by key, per owner, most recently used last. Bounded
 * per owner (entries and characters) and in owners; an owner typing in one worksheet
 * keeps everything of that worksheet.
 */
export class ReuseCache {
  private owners = new Map<string, Map<string, { json: string; line: string }>>();

  constructor(
    // at most 64 owners x 2 M characters (about 256 MB of UTF-16 at worst; an owner's own worksheet is far less)
    private readonly limits = { owners: 64, entriesPerOwner: 400, charsPerOwner: 2 * 1024 * 1024 },
  ) {}

  /**
   * The owner's records to offer a worker for `source`: only those whose statement's first
   * line is a line of the source (a record under another key is of no use, and each one
   * offered is copied to the worker).
   */
  offer(owner: string, source: string): [string, string][] {
    const mine = this.owners.get(owner);
    if (!mine) return [];
    // the owner is the most recent
    this.owners.delete(owner);
    this.owners.set(owner, mine);
    const lines = new Set(source.split(/\r?\n/));
    const out: [string, string][] = [];
    for (const [key, { line, json }] of mine) if (lines.has(line)) out.push([key, json]);
    return out;
  }

  /** Keeps a record under its key; `line` is the first line of its statement as written. */
  keep(owner: string, key: string, json: string, line: string): void {
    if (json.length > this.limits.charsPerOwner) return;
    let mine = this.owners.get(owner);
    if (!mine) {
      mine = new Map();
      this.owners.set(owner, mine);
      if (this.owners.size > this.limits.owners) this.owners.delete(this.owners.keys().next().value!);
    }
    mine.delete(key);
    mine.set(key, { json, line });
    let chars = 0;
    for (const v of mine.values()) chars += v.json.length;
    for (const [k, v] of mine) {
      if (mine.size <= this.limits.entriesPerOwner && chars <= this.limits.charsPerOwner) break;
      mine.delete(k);
      chars -= v.json.length;
    }
  }

  clear(): void {
    this.owners.clear();
  }
}
