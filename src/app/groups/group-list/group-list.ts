import { PendingReviews } from '../../reviews/pending-reviews/pending-reviews';
import { ChangeDetectionStrategy, Component, OnInit, inject, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router, RouterLink } from '@angular/router';
import { LIMITS, groupBody, type GroupSummaryDto } from '@shared/api';
import { applySchemaIssues, fieldMessage } from '../../core/forms/schema-errors';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { GroupsApi } from '../groups-api';

@Component({
  selector: 'app-group-list',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatInputModule, RouterLink, PendingReviews],
  templateUrl: './group-list.html',
  styleUrl: './group-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GroupList implements OnInit {
  private readonly api = inject(GroupsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  protected readonly limits = LIMITS;
  protected readonly message = fieldMessage;
  protected readonly groups = signal<GroupSummaryDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly creating = signal(false);
  protected readonly createForm = inject(NonNullableFormBuilder).group({ name: ['', Validators.required] });

  ngOnInit(): void {
    this.load();
  }

  protected load(): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.list().subscribe({
      next: (groups) => {
        this.groups.set(groups);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected create(): void {
    const parsed = groupBody.safeParse(this.createForm.getRawValue());
    if (!parsed.success) {
      applySchemaIssues(this.createForm, parsed.error.issues);
      return;
    }
    this.creating.set(true);
    this.api.create(parsed.data.name).subscribe({
      next: (group) => {
        this.creating.set(false);
        this.notifier.info(`Group “${group.name}” created.`);
        void this.router.navigate(['/groups', group.id]);
      },
      error: (err: unknown) => {
        this.creating.set(false);
        this.notifier.error(err);
      },
    });
  }

  protected plural(n: number, word: string): string {
    return `${n} ${word}${n === 1 ? '' : 's'}`;
  }
}
