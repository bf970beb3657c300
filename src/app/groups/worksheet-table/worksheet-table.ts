import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { Subject, catchError, debounceTime, distinctUntilChanged, of, switchMap, tap } from 'rxjs';
import {
  LIMITS,
  WORKSHEET_SORT_FIELDS,
  createWorksheetBody,
  roleCan,
  type GroupRole,
  type WorksheetListQuery,
  type WorksheetSortField,
  type WorksheetSummaryDto,
} from '@shared/api';
import { applySchemaIssues, fieldMessage } from '../../core/forms/schema-errors';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { WorksheetsApi } from '../../worksheets/worksheets-api';

const DEFAULT_SORT: WorksheetSortField = 'updatedAt';
const DEFAULT_DIRECTION = 'desc' as const;

/** A group's worksheets: filter, sort and pages are done by the server. */
@Component({
  selector: 'app-worksheet-table',
  imports: [
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatPaginatorModule,
    MatSortModule,
    MatTableModule,
  ],
  templateUrl: './worksheet-table.html',
  styleUrl: './worksheet-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class WorksheetTable {
  private readonly api = inject(WorksheetsApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  readonly groupId = input.required<number>();
  readonly role = input.required<GroupRole>();

  protected readonly limits = LIMITS;
  protected readonly message = fieldMessage;
  protected readonly columns = ['title', 'version', 'updatedBy', 'updatedAt'];
  protected readonly pageSizes = [10, 25, 50];

  protected readonly search = signal('');
  protected readonly sort = signal<WorksheetSortField>(DEFAULT_SORT);
  protected readonly direction = signal<'asc' | 'desc'>(DEFAULT_DIRECTION);
  protected readonly page = signal(0);
  protected readonly pageSize = signal(10);

  protected readonly rows = signal<WorksheetSummaryDto[]>([]);
  protected readonly total = signal(0);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly reload = signal(0);

  protected readonly canCreate = computed(() => roleCan(this.role(), 'editWorksheets'));
  protected readonly showCreate = signal(false);
  protected readonly creating = signal(false);
  protected readonly createForm = inject(NonNullableFormBuilder).group({ title: ['', Validators.required] });

  private readonly query = computed(() => ({
    groupId: this.groupId(),
    reload: this.reload(),
    query: {
      search: this.search(),
      sort: this.sort(),
      direction: this.direction(),
      page: this.page(),
      pageSize: this.pageSize(),
    } satisfies WorksheetListQuery,
  }));
  private readonly filterInput = new Subject<string>();

  constructor() {
    this.filterInput
      .pipe(debounceTime(300), distinctUntilChanged(), takeUntilDestroyed())
      .subscribe((value) => this.applyFilter(value));

    toObservable(this.query)
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.error.set(null);
        }),
        switchMap(({ groupId, query }) =>
          this.api.list(groupId, query).pipe(
            catchError((err: unknown) => {
              this.error.set(apiErrorMessage(err));
              return of(null);
            }),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((page) => {
        this.loading.set(false);
        if (!page) return;
        this.rows.set(page.items);
        this.total.set(page.total);
      });
  }

  protected onFilterInput(value: string): void {
    this.filterInput.next(value.slice(0, LIMITS.searchLength));
  }

  /** Apply the filter now (Enter, or after the typing pause). */
  applyFilter(value: string): void {
    const search = value.trim().slice(0, LIMITS.searchLength);
    if (search === this.search()) return;
    this.search.set(search);
    this.page.set(0);
  }

  protected onSort(sort: Sort): void {
    const field = (WORKSHEET_SORT_FIELDS as readonly string[]).includes(sort.active)
      ? (sort.active as WorksheetSortField)
      : DEFAULT_SORT;
    if (sort.direction === '') {
      this.sort.set(DEFAULT_SORT);
      this.direction.set(DEFAULT_DIRECTION);
    } else {
      this.sort.set(field);
      this.direction.set(sort.direction);
    }
    this.page.set(0);
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.page.set(event.pageIndex);
  }

  protected retry(): void {
    this.reload.update((n) => n + 1);
  }

  protected create(): void {
    const parsed = createWorksheetBody.safeParse({
      title: this.createForm.getRawValue().title,
      source: '',
    });
    if (!parsed.success) {
      applySchemaIssues(this.createForm, parsed.error.issues);
      return;
    }
    const source = `# ${parsed.data.title}\n`;
    this.creating.set(true);
    this.api.create(this.groupId(), { title: parsed.data.title, source }).subscribe({
      next: (ws) => {
        this.creating.set(false);
        void this.router.navigate(['/worksheets', ws.id]);
      },
      error: (err: unknown) => {
        this.creating.set(false);
        this.notifier.error(err);
      },
    });
  }
}
