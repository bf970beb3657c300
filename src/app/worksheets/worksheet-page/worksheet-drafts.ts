/** A draft kept in this browser until the server has it, so nothing typed is lost. */
export interface LocalDraft {
  source: string;
  title: string;
  /** The server version the draft was based on. */
  baseVersion: number;
  savedAt: string;
}

const key = (id: number) => `sheetwise.draft.${id}`;

export function readDraft(id: number): LocalDraft | null {
  try {
    const raw = localStorage.getItem(key(id));
    if (!raw) return null;
    const d = JSON.parse(raw) as Partial<LocalDraft>;
    return typeof d.source === 'string' && typeof d.baseVersion === 'number'
      ? { source: d.source, title: d.title ?? '', baseVersion: d.baseVersion, savedAt: d.savedAt ?? '' }
      : null;
  } catch {
    return null;
  }
}

export function writeDraft(id: number, draft: Omit<LocalDraft, 'savedAt'>): void {
  try {
    localStorage.setItem(key(id), JSON.stringify({ ...draft, savedAt: new Date().toISOString() }));
  } catch {
    // Storage full or off: the server save is then the only copy.
  }
}

export function clearDraft(id: number): void {
  try {
    localStorage.removeItem(key(id));
  } catch {
    // ignore
  }
}
