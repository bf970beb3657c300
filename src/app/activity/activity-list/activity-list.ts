import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { apiErrorMessage } from '../../core/http/api-error';
import { ActivityApi, type ActivityDto } from '../activity-api';

const ICONS: [RegExp, string][] = [
  [/review|confirmed|disputed/, 'rate_review'],
  [/comment/, 'chat'],
  [/referee/, 'link'],
  [/attached/, 'attach_file'],
  [/import/, 'upload_file'],
  [/export/, 'ios_share'],
  [/member|invit|role/, 'group'],
  [/delet|remov|revok/, 'delete'],
];

/** The group page's Activity tab: who did what, when, newest first. */
@Component({
  selector: 'app-activity-list',
  imports: [DatePipe, MatButtonModule, RouterLink],
  templateUrl: './activity-list.html',
  styleUrl: './activity-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ActivityList {
  private readonly api = inject(ActivityApi);
  readonly groupId = input.required<number>();

  protected readonly items = signal<ActivityDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => this.load(this.groupId()));
  }

  load(groupId = this.groupId()): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.forGroup(groupId).subscribe({
      next: (items) => {
        this.items.set(items);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected icon(a: ActivityDto): string {
    return ICONS.find(([re]) => re.test(a.action))?.[1] ?? 'edit_note';
  }
}
