import { CanDeactivateFn } from '@angular/router';

/** A screen with text that is not saved yet. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/** Ask before leaving a worksheet with unsaved text, so no text is lost by a stray click. */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (component) =>
  !component?.hasUnsavedChanges() ||
  window.confirm('This worksheet has changes that are not saved. Leave and discard them?');
