import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

@Component({
  selector: 'app-not-found',
  imports: [MatButtonModule, RouterLink],
  template: `
    <div class="sw-page">
      <p class="sw-eyebrow">Not found</p>
      <h1>There is nothing at this address</h1>
      <p class="sw-muted">The link may be old, or the item was deleted.</p>
      <a mat-flat-button routerLink="/groups">Go to your groups</a>
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NotFound {}
