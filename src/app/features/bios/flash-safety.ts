import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The cautions shown beside every ROM download: a bad image can stop a card from starting. */
@Component({
  selector: 'em-flash-safety',
  imports: [MatIconModule],
  template: `
    <aside class="em-caution" role="note" aria-labelledby="flash-safety-title">
      <mat-icon aria-hidden="true">warning</mat-icon>
      <div>
        <h2 id="flash-safety-title">Before you flash</h2>
        <ul>
          <li>Keep the original image: it is kept here too, beside every patched one.</li>
          <li>After burning, read the chip back and compare it with the file byte for byte.</li>
          <li>Have a way back before you start: a second card to boot from, or an EEPROM programmer and clip.</li>
          <li>Follow the card's and the chip's own documentation for the flash tool, voltage and write protection.</li>
        </ul>
        <p class="fine">
          Emberline writes only the standard VGA parameter table. Vendor extension registers — clock synthesisers, extended CRTC bits,
          flat-panel tables — are out of scope: a card that reprograms them at start-up may ignore or override the patched entry.
        </p>
      </div>
    </aside>
  `,
  styles: `
    ul {
      margin: 4px 0;
      padding-left: 18px;
      display: grid;
      gap: 2px;
    }
    .fine {
      margin-top: 6px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FlashSafety {}
