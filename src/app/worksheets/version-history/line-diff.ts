/** One line of a line diff: kept, removed (only in the older text) or added (only in the newer). */
export interface DiffLine {
  op: 'same' | 'removed' | 'added';
  text: string;
  /** Line number in the older text (same, removed) and in the newer (same, added). */
  a: number | null;
  b: number | null;
}

/** Above this many cells the middle part is shown as removed then added, not aligned line by line. */
const MAX_CELLS = 4_000_000;

/**
 * The lines of `older` and `newer` aligned by a longest common subsequence, after the
 * common head and tail are taken off (so a small edit in a long worksheet costs little).
 */
export function lineDiff(older: string, newer: string): DiffLine[] {
  const a = older.replace(/\r\n?/g, '\n').split('\n');
  const b = newer.replace(/\r\n?/g, '\n').split('\n');
  let head = 0;
  while (head < a.length && head < b.length && a[head] === b[head]) head++;
  let tail = 0;
  while (tail < a.length - head && tail < b.length - head && a[a.length - 1 - tail] === b[b.length - 1 - tail]) tail++;
  const out: DiffLine[] = [];
  for (let i = 0; i < head; i++) out.push({ op: 'same', text: a[i]!, a: i + 1, b: i + 1 });
  const am = a.slice(head, a.length - tail);
  const bm = b.slice(head, b.length - tail);
  const n = am.length;
  const m = bm.length;
  if (n * m > MAX_CELLS) {
    am.forEach((text, i) => out.push({ op: 'removed', text, a: head + i + 1, b: null }));
    bm.forEach((text, j) => out.push({ op: 'added', text, a: null, b: head + j + 1 }));
  } else {
    // lcs[i][j]: the common subsequence length of am[i..] and bm[j..].
    const lcs = Array.from({ length: n + 1 }, () => new Int32Array(m + 1));
    for (let i = n - 1; i >= 0; i--) for (let j = m - 1; j >= 0; j--) lcs[i]![j] = am[i] === bm[j] ? lcs[i + 1]![j + 1]! + 1 : Math.max(lcs[i + 1]![j]!, lcs[i]![j + 1]!);
    let i = 0;
    let j = 0;
    while (i < n || j < m) {
      if (i < n && j < m && am[i] === bm[j]) out.push({ op: 'same', text: am[i]!, a: head + ++i, b: head + ++j });
      else if (i < n && (j === m || lcs[i + 1]![j]! >= lcs[i]![j + 1]!)) out.push({ op: 'removed', text: am[i]!, a: head + ++i, b: null });
      else out.push({ op: 'added', text: bm[j]!, a: null, b: head + ++j });
    }
  }
  for (let k = tail; k > 0; k--) out.push({ op: 'same', text: a[a.length - k]!, a: a.length - k + 1, b: b.length - k + 1 });
  return out;
}

/** A run of lines to show: changed lines with `context` unchanged lines around them; longer unchanged runs fold into a count. */
export type DiffRow = DiffLine | { op: 'fold'; count: number };

export function foldDiff(lines: DiffLine[], context = 2): DiffRow[] {
  const near = lines.map(() => false);
  lines.forEach((l, k) => {
    if (l.op === 'same') return;
    for (let d = -context; d <= context; d++) if (k + d >= 0 && k + d < lines.length) near[k + d] = true;
  });
  const out: DiffRow[] = [];
  let folded = 0;
  lines.forEach((l, k) => {
    if (near[k]) {
      if (folded) out.push({ op: 'fold', count: folded });
      folded = 0;
      out.push(l);
    } else folded++;
  });
  if (folded) out.push({ op: 'fold', count: folded });
  return out;
}
