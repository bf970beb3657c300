import type { DraftStore } from './draft-store';

/** The save state of the draft in a few words and an icon, for the page's status line. */
export function saveStatus(store: DraftStore): { text: string; icon: string } {
  const base = store.base();
  if (!base) return { text: '', icon: '' };
  if (!store.canEdit()) return { text: `Read only · version ${base.version}`, icon: 'visibility' };
  switch (store.saveState()) {
    case 'saving':
      return { text: 'Saving…', icon: 'sync' };
    case 'conflict': {
      const other = store.conflict();
      const text = other
        ? `Not saved: ${other.updatedBy} saved version ${other.version} meanwhile`
        : 'Not saved: someone saved meanwhile';
      return { text, icon: 'cloud_off' };
    }
    case 'error':
      return { text: `Not saved: ${store.saveError() ?? 'the server did not accept the save'}`, icon: 'cloud_off' };
    default:
      if (store.dirty() && store.draftState() === 'kept') return { text: `Draft kept · on version ${base.version}`, icon: 'edit_note' };
      if (store.dirty()) return { text: `Unsaved changes · based on version ${base.version}`, icon: 'edit_note' };
      return { text: store.saveState() === 'saved' ? `Saved · version ${base.version}` : `Version ${base.version}`, icon: 'cloud_done' };
  }
}
