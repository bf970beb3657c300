import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { Logo } from '../../layout/logo/logo';

/** The two-column frame shared by sign-in and registration. */
@Component({
  selector: 'app-auth-frame',
  imports: [Logo],
  templateUrl: './auth-frame.html',
  styleUrl: './auth-frame.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuthFrame {
  readonly heading = input.required<string>();
}
