import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { Router, RouterLink } from '@angular/router';
import { PendingReviewsStore } from '../reviews/pending-reviews/pending-reviews-store';

/** The top bar's link to the review queue with the number of reviews waiting (none: no number); F1 opens the language reference. */
@Component({
  selector: 'app-top-bar-reviews',
  imports: [RouterLink],
  template: `
    <a routerLink="/reviews" class="reviews-link" data-testid="pending-count-link" [attr.aria-label]="label()" [title]="label()">
      <span class="material-symbols-outlined" aria-hidden="true">rate_review</span>
      @if (store.count()) {
        <span class="badge" data-testid="pending-count" aria-hidden="true">{{ store.count() > 99 ? '99+' : store.count() }}</span>
      }
    </a>
  `,
  styles: `
    .reviews-link { position: relative; display: inline-flex; align-items: center; justify-content: center; width: 40px; height: 40px; border-radius: 50%; color: inherit; text-decoration: none; }
    .reviews-link:hover { background: color-mix(in srgb, currentColor 10%, transparent); }
    .badge {
      position: absolute; top: 2px; right: 0; min-width: 1.1rem; height: 1.1rem; padding: 0 0.25rem; box-sizing: border-box;
      border-radius: 0.55rem; font-size: 0.7rem; font-weight: 700; line-height: 1.1rem; text-align: center;
      background: var(--sw-tone-caution-ink, #8a4b00); color: var(--sw-surface, #fff);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:keydown)': 'onKeydown($event)' },
})
export class TopBarReviews {
  private readonly router = inject(Router);

  /**
   * F1 opens the language reference, except on a worksheet page, whose F1 shows its keys
   * sheet (with a link to the reference) and whose editor hovers link to the reference.
   */
  protected onKeydown(event: KeyboardEvent): void {
    if (event.key !== 'F1' || event.ctrlKey || event.metaKey || event.altKey || event.defaultPrevented) return;
    if (this.router.url.startsWith('/worksheets/')) return;
    event.preventDefault();
    if (!this.router.url.startsWith('/language')) void this.router.navigate(['/language']);
  }

  protected readonly store = inject(PendingReviewsStore);
  protected readonly label = computed(() => {
    const n = this.store.count();
    return n ? `Reviews: ${n} waiting for you` : 'Reviews: none waiting for you';
  });
}
