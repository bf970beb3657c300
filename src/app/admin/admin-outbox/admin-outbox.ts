import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, OnInit, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatTableModule } from '@angular/material/table';
import { MatTabsModule } from '@angular/material/tabs';
import { DomSanitizer, type SafeHtml } from '@angular/platform-browser';
import { forkJoin } from 'rxjs';
import type { MailDeliveryDto, OutboxMessageDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { AdminApi } from '../admin-api';

/** How each delivery state reads: an icon, a word and a tone (colour is never the only signal). */
export const DELIVERY_STATUS: Record<MailDeliveryDto['status'], { icon: string; word: string; tone: string }> = {
  sent: { icon: 'check_circle', word: 'Sent', tone: 'tone-good' },
  pending: { icon: 'schedule', word: 'Pending', tone: 'tone-caution' },
  failed: { icon: 'error', word: 'Failed', tone: 'tone-bad' },
};

/** Site administration: the mail the product sent (as the capture server received it) and its delivery. */
@Component({
  selector: 'app-admin-outbox',
  imports: [DatePipe, MatButtonModule, MatTableModule, MatTabsModule],
  templateUrl: './admin-outbox.html',
  styleUrl: './admin-outbox.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AdminOutbox implements OnInit {
  private readonly api = inject(AdminApi);
  private readonly sanitizer = inject(DomSanitizer);

  protected readonly messageColumns = ['to', 'subject', 'sentAt'];
  protected readonly deliveryColumns = ['status', 'to', 'subject', 'attempts', 'lastError', 'createdAt'];

  protected readonly messages = signal<OutboxMessageDto[]>([]);
  protected readonly deliveries = signal<MailDeliveryDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly selectedId = signal<number | null>(null);

  protected readonly selected = computed(
    () => this.messages().find((m) => m.id === this.selectedId()) ?? null,
  );
  /**
   * The HTML part, for the srcdoc of an iframe with an empty sandbox: no scripts, no
   * forms, no navigation, an opaque origin. It never reaches this document's DOM, so
   * Angular's sanitizer (which would drop the mail's inline styles) is not needed here.
   */
  protected readonly selectedHtml = computed<SafeHtml | null>(() => {
    const message = this.selected();
    return message ? this.sanitizer.bypassSecurityTrustHtml(message.html) : null;
  });
  protected readonly failedCount = computed(() => this.deliveries().filter((d) => d.status === 'failed').length);
  protected readonly pendingCount = computed(() => this.deliveries().filter((d) => d.status === 'pending').length);

  ngOnInit(): void {
    this.load();
  }

  protected load(): void {
    this.loading.set(true);
    this.error.set(null);
    forkJoin({ messages: this.api.outbox(), deliveries: this.api.mailDeliveries() }).subscribe({
      next: ({ messages, deliveries }) => {
        this.messages.set(messages);
        this.deliveries.set(deliveries);
        if (!messages.some((m) => m.id === this.selectedId())) this.selectedId.set(messages[0]?.id ?? null);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected statusOf(delivery: MailDeliveryDto): (typeof DELIVERY_STATUS)[MailDeliveryDto['status']] {
    return DELIVERY_STATUS[delivery.status];
  }

  protected select(message: OutboxMessageDto): void {
    this.selectedId.set(message.id);
  }
}
