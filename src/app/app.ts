import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatToolbarModule } from '@angular/material/toolbar';
import { RouterLink, RouterOutlet } from '@angular/router';
import { AuthStore } from './core/auth/auth-store';
import { ThemeStore } from './core/theme/theme-store';
import { LoadingTracker } from './core/loading/loading-tracker';
import { AccountMenu } from './layout/account-menu/account-menu';
import { Logo } from './layout/logo/logo';
import { TopBarReviews } from './layout/top-bar-reviews';

/** The frame around every screen: the bar with the name and account menu, the fetch indicator. */
@Component({
  selector: 'app-root',
  imports: [RouterOutlet, RouterLink, MatToolbarModule, MatProgressBarModule, AccountMenu, Logo, TopBarReviews],
  templateUrl: './app.html',
  styleUrl: './app.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class App {
  protected readonly auth = inject(AuthStore);
  protected readonly loading = inject(LoadingTracker);
  protected readonly theme = inject(ThemeStore);
}
