import { ChangeDetectionStrategy, Component, OnInit, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatTableModule } from '@angular/material/table';
import type { UserDto } from '@shared/api';
import { AuthStore } from '../../core/auth/auth-store';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { AdminApi } from '../admin-api';
import { Confirmer } from '../../core/dialogs/confirmer';

/** Site administration: every account, with a switch to disable or enable it. */
@Component({
  selector: 'app-admin-users',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule, MatTableModule],
  templateUrl: './admin-users.html',
  styleUrl: './admin-users.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AdminUsers implements OnInit {
  private readonly confirmer = inject(Confirmer);
  private readonly api = inject(AdminApi);
  private readonly notifier = inject(Notifier);
  private readonly auth = inject(AuthStore);

  protected readonly columns = ['displayName', 'email', 'siteRole', 'status', 'actions'];
  protected readonly users = signal<UserDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = signal<number | null>(null);
  protected readonly filter = signal('');
  protected readonly me = computed(() => this.auth.user()?.id ?? null);
  protected readonly shown = computed(() => {
    const f = this.filter().trim().toLowerCase();
    return f
      ? this.users().filter((u) => u.email.toLowerCase().includes(f) || u.displayName.toLowerCase().includes(f))
      : this.users();
  });

  ngOnInit(): void {
    this.load();
  }

  protected load(): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.users().subscribe({
      next: (users) => {
        this.users.set(users);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected toggle(user: UserDto): void {
    const disabled = !user.disabled;
    if (!disabled) return this.setDisabled(user, disabled);
    this.confirmer
      .ask({ title: 'Disable this account?', message: `Disable the account of ${user.displayName}? They can no longer sign in.`, confirm: 'Disable', danger: true })
      .subscribe((ok) => ok && this.setDisabled(user, disabled));
  }

  private setDisabled(user: UserDto, disabled: boolean): void {
    this.busy.set(user.id);
    this.api.setDisabled(user.id, disabled).subscribe({
      next: (updated) => {
        this.busy.set(null);
        this.users.update((list) => list.map((u) => (u.id === updated.id ? updated : u)));
        this.notifier.info(`${updated.displayName}: account ${updated.disabled ? 'disabled' : 'enabled'}.`);
      },
      error: (err: unknown) => {
        this.busy.set(null);
        this.notifier.error(err);
      },
    });
  }
}
