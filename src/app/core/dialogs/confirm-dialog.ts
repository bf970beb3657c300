import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';

/** What a confirmation asks: the question, what it does, and the words of its two buttons. */
export interface ConfirmRequest {
  title: string;
  message: string;
  /** The button that does it, in words ("Delete", "Withdraw"). */
  confirm: string;
  /** The button that keeps things as they are; "Cancel" unless said. */
  cancel?: string;
  /** A destructive action: its button is drawn in the warning colour. The safe button comes first and has the focus. */
  danger?: boolean;
}

/**
 * A question before an action that cannot be undone or loses text (instead of window.confirm,
 * which cannot be styled, tested or read by our screen-reader text). Closes with true or false.
 */
@Component({
  selector: 'app-confirm-dialog',
  imports: [MatButtonModule, MatDialogModule],
  template: `
    <h2 mat-dialog-title>{{ data.title }}</h2>
    <mat-dialog-content>
      <p data-testid="confirm-message">{{ data.message }}</p>
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false" data-testid="confirm-cancel">
        {{ data.cancel ?? 'Cancel' }}
      </button>
      <button mat-flat-button type="button" [class.danger]="data.danger" [mat-dialog-close]="true" data-testid="confirm-accept">
        {{ data.confirm }}
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    .danger {
      --mat-button-filled-container-color: var(--sw-warn);
      --mat-button-filled-label-text-color: #fff;
    }
  `,
  host: { 'data-testid': 'confirm-dialog' },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfirmDialog {
  protected readonly data = inject<ConfirmRequest>(MAT_DIALOG_DATA);
}
