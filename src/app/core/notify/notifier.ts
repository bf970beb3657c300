import { Injectable, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';
import { apiErrorMessage } from '../http/api-error';

/** Short messages at the bottom of the screen: confirmations and errors in plain words. */
@Injectable({ providedIn: 'root' })
export class Notifier {
  private readonly snackBar = inject(MatSnackBar);

  info(message: string): void {
    this.snackBar.open(message, 'Close', { duration: 4000 });
  }

  error(errOrMessage: unknown): void {
    const message = typeof errOrMessage === 'string' ? errOrMessage : apiErrorMessage(errOrMessage);
    this.snackBar.open(message, 'Close', { duration: 8000, panelClass: 'sw-error-snack' });
  }
}
