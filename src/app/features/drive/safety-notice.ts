import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The high-voltage cautions shown wherever drive timing or hardware data is shown. */
@Component({
  selector: 'em-safety-notice',
  imports: [MatIconModule],
  template: `
    <aside class="notice" role="note" aria-labelledby="safety-title">
      <mat-icon aria-hidden="true">bolt</mat-icon>
      <div>
        <h2 id="safety-title">High voltage: read before you probe</h2>
        <p>
          EL panels are driven with pulses of roughly 180–250 V; a CRT's anode holds 10–30 kV and keeps its charge
          after switch-off. Disconnect power and discharge the drive circuits (and a tube's anode, with the proper tool)
          before touching or probing. Only qualified people should work on live drive electronics.
        </p>
        <p class="fine">
          These figures are a starting point, not a specification: the panel's own documentation, your local electrical
          codes and qualified practice take precedence.
        </p>
      </div>
    </aside>
  `,
  styles: `
    .notice {
      display: flex;
      gap: 16px;
      padding: 16px 20px;
      border-radius: var(--mat-sys-corner-large);
      background: color-mix(in srgb, var(--mat-sys-error) 12%, var(--mat-sys-surface-container-low));
      border: 1px solid color-mix(in srgb, var(--mat-sys-error) 45%, transparent);
      margin-bottom: 24px;
    }
    mat-icon {
      color: var(--mat-sys-error);
      flex: none;
    }
    h2 {
      font: var(--mat-sys-title-medium);
      margin-bottom: 4px;
    }
    p {
      margin: 4px 0;
    }
    .fine {
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SafetyNotice {}
