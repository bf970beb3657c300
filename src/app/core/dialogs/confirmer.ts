import { Injectable, inject } from '@angular/core';
import { MatDialog } from '@angular/material/dialog';
import { Observable, map } from 'rxjs';
import { ConfirmDialog, type ConfirmRequest } from './confirm-dialog';

/** Asks the user to confirm an action in a Material dialog; emits once, true only on the confirming button. */
@Injectable({ providedIn: 'root' })
export class Confirmer {
  private readonly dialog = inject(MatDialog);

  ask(request: ConfirmRequest): Observable<boolean> {
    return this.dialog
      .open<ConfirmDialog, ConfirmRequest, boolean>(ConfirmDialog, {
        data: request,
        width: '28rem',
        role: 'alertdialog',
        // The first button is the safe one, so Enter right after opening never destroys anything.
        autoFocus: 'first-tabbable',
      })
      .afterClosed()
      .pipe(map((ok) => ok === true));
  }
}
