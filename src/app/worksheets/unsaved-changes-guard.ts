import { Injector, inject } from '@angular/core';
import { CanDeactivateFn } from '@angular/router';
import { firstValueFrom } from 'rxjs';

/** A screen with text that is not saved yet. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

/**
 * Ask before leaving a worksheet with unsaved text, so no text is lost by a stray click. The
 * dialog is loaded only when needed: the routes (and this guard) are in the initial bundle.
 */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (component) => {
  if (!component?.hasUnsavedChanges()) return true;
  const injector = inject(Injector);
  return import('../core/dialogs/confirmer').then(({ Confirmer }) =>
    firstValueFrom(
      injector.get(Confirmer).ask({
        title: 'Leave without saving?',
        message: 'This worksheet has changes that are not saved. Leave and discard them?',
        confirm: 'Leave and discard',
        cancel: 'Stay',
        danger: true,
      }),
    ),
  );
};
