import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import type { Observable } from 'rxjs';
import type { WorksheetDto } from '@shared/api';
import { ConflictDiff } from '../editor/conflict-diff';

export interface ConflictData {
  theirs: WorksheetDto;
  /** The user's text that was not saved. */
  mine: string;
}

/** The choice made: take theirs (the user's text is set aside), keep mine on top, or save the merge. */
export type ConflictChoice = { choice: 'theirs' } | { choice: 'mine' } | { choice: 'merged'; text: string };

/**
 * A save lost the race: their version beside the user's text, editable to merge by hand.
 * Nothing was overwritten, and the primary button is the safe choice (take theirs, keeping
 * the user's text aside); overwriting theirs is a secondary button.
 */
@Component({
  selector: 'app-conflict-dialog',
  imports: [DatePipe, MatButtonModule, MatDialogModule, ConflictDiff],
  template: `
    @let theirs = data.theirs;
    <h2 mat-dialog-title id="conflict-heading">
      <span class="material-symbols-outlined" aria-hidden="true">merge_type</span>
      Someone saved this worksheet while you were editing
    </h2>
    <mat-dialog-content data-testid="save-conflict">
      <p role="alert">
        <strong>{{ theirs.updatedBy }}</strong> saved <strong>version {{ theirs.version }}</strong>
        at <time [attr.datetime]="theirs.updatedAt">{{ theirs.updatedAt | date: 'HH:mm, d MMM y' }}</time>.
        Your text was not saved and nothing was overwritten. Their version is on the left, yours on the right;
        you can edit the right side to merge by hand.
      </p>
      <div class="diff-labels" aria-hidden="true">
        <span>Theirs · version {{ theirs.version }}</span><span>Yours (editable)</span>
      </div>
      <app-conflict-diff [theirs]="theirs.source" [mine]="merged()" (mineChange)="merged.set($event)" />
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-stroked-button type="button" (click)="close({ choice: 'merged', text: merged() })" data-testid="save-merged" [disabled]="merged() === data.mine">
        <span class="material-symbols-outlined" aria-hidden="true">call_merge</span> Save the merged text
      </button>
      <button mat-stroked-button type="button" (click)="close({ choice: 'mine' })" data-testid="keep-mine">
        <span class="material-symbols-outlined" aria-hidden="true">person</span> Keep mine as version {{ theirs.version + 1 }}
      </button>
      <button mat-flat-button type="button" (click)="close({ choice: 'theirs' })" data-testid="take-theirs" cdkFocusInitial>
        <span class="material-symbols-outlined" aria-hidden="true">group</span> Take theirs (yours is kept aside)
      </button>
    </mat-dialog-actions>
  `,
  styles: `
    h2 { display: flex; gap: 0.5rem; align-items: center; }
    .diff-labels {
      display: grid;
      grid-template-columns: 1fr 1fr;
      font-size: 0.82rem;
      font-weight: 600;
      color: var(--sw-muted-ink);
      margin-bottom: 0.2rem;
    }
    mat-dialog-actions { flex-wrap: wrap; gap: 0.4rem; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConflictDialog {
  protected readonly data = inject<ConflictData>(MAT_DIALOG_DATA);
  private readonly ref = inject<MatDialogRef<ConflictDialog, ConflictChoice>>(MatDialogRef);
  protected readonly merged = signal(this.data.mine);

  protected close(choice: ConflictChoice): void {
    this.ref.close(choice);
  }
}

/** Show the conflict (once: null when its dialog is already open); a choice is required to close it. */
export function openConflictDialog(dialog: MatDialog, data: ConflictData): Observable<ConflictChoice | undefined> | null {
  if (dialog.openDialogs.some((d) => d.componentInstance instanceof ConflictDialog)) return null;
  return dialog
    .open<ConflictDialog, ConflictData, ConflictChoice>(ConflictDialog, {
      data,
      width: 'min(1100px, 96vw)',
      maxWidth: '96vw',
      disableClose: true,
      ariaLabelledBy: 'conflict-heading',
    })
    .afterClosed();
}
