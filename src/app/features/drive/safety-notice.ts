import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The high-voltage cautions shown wherever drive timing or hardware data is shown. */
@Component({
  selector: 'em-safety-notice',
  imports: [MatIconModule],
  template: `
    <aside class="em-caution" role="note" aria-labelledby="safety-title">
      <mat-icon aria-hidden="true">bolt</mat-icon>
      <div>
        <h2 id="safety-title">High voltage: read before you probe</h2>
        <p>
          EL panels are driven with pulses of roughly 180–250 V; a CRT's anode holds 10–30 kV and keeps its charge after switch-off.
          Disconnect power and discharge the drive circuits (and a tube's anode, with the proper tool) before touching or probing. Only
          qualified people should work on live drive electronics.
        </p>
        <p class="fine">
          These figures are a starting point, not a specification: the panel's own documentation, your local electrical codes and qualified
          practice take precedence.
        </p>
      </div>
    </aside>
  `,
  styles: `
    :host {
      display: block;
      margin-bottom: 24px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SafetyNotice {}
