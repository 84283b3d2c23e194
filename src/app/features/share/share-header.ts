import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The top of a page opened by a share link: the brand, and what the page is, read-only. */
@Component({
  selector: 'em-share-header',
  imports: [MatIconModule],
  template: `
    <span class="brand"><img src="assets/emberline-mark.svg" alt="" width="28" height="28" /> Emberline</span>
    <span class="ro"><mat-icon aria-hidden="true">visibility</mat-icon> {{ what() }} · read-only</span>
  `,
  styles: `
    :host {
      display: flex;
      justify-content: space-between;
      align-items: center;
      gap: 8px;
      flex-wrap: wrap;
      margin-bottom: 24px;
    }
    .brand {
      display: flex;
      align-items: center;
      gap: 8px;
      color: var(--mat-sys-primary);
      font: var(--mat-sys-title-large);
      text-shadow: var(--em-glow);
    }
    .ro {
      display: flex;
      align-items: center;
      gap: 6px;
      color: var(--mat-sys-on-surface-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShareHeader {
  /** What the link opened, e.g. "Shared look". */
  readonly what = input.required<string>();
}
