import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/** The Sheetwise mark: a sheet with a contour sweeping past a pole. */
@Component({
  selector: 'app-logo',
  template: `
    <svg [attr.width]="size()" [attr.height]="size()" viewBox="0 0 32 32" role="img" aria-label="Sheetwise">
      <rect x="3" y="2.5" width="24" height="27" rx="4" fill="#f7f5f0" stroke="#0b4f63" stroke-opacity=".35" />
      <path d="M21 2.5h2a4 4 0 0 1 4 4v2z" fill="#d9d4c7" />
      <path
        d="M8.5 23.5c3.2 0 4-3.4 5.2-7.5s2.2-8 5.8-8"
        fill="none"
        stroke="#0b4f63"
        stroke-width="2.4"
        stroke-linecap="round"
      />
      <path d="M7.5 13.5h15" stroke="#0b4f63" stroke-opacity=".28" stroke-width="1.2" />
      <circle cx="21.5" cy="20" r="2.3" fill="#d98a3d" />
    </svg>
  `,
  styles: `
    :host {
      display: inline-flex;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Logo {
  readonly size = input(28);
}
