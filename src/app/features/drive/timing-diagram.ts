import { ChangeDetectionStrategy, Component, computed, DestroyRef, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { timingDiagramSvg } from '@shared/drive/diagram';
import type { PanelInterface } from '@shared/drive/interface';
import type { Timing } from '@shared/drive/timing';
import { downloadText } from './download';

/** The line and frame diagram (shared SVG generator), shown as an image and downloadable. */
@Component({
  selector: 'em-timing-diagram',
  imports: [MatButtonModule, MatIconModule],
  template: `
    <div class="head">
      <h2>Timing diagram</h2>
      <button mat-stroked-button (click)="downloadSvg()"><mat-icon>download</mat-icon> SVG</button>
    </div>
    <img [src]="url()" [alt]="'Timing diagram of one line and one frame of ' + timing().name" />
  `,
  styles: `
    .head {
      display: flex;
      justify-content: space-between;
      align-items: center;
      margin-bottom: 8px;
    }
    h2 {
      font: var(--mat-sys-title-large);
    }
    img {
      width: 100%;
      height: auto;
      border-radius: var(--mat-sys-corner-medium);
      border: 1px solid var(--mat-sys-outline-variant);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TimingDiagram {
  readonly timing = input.required<Timing>();
  readonly panelInterface = input<PanelInterface>();

  protected readonly svg = computed(() => timingDiagramSvg(this.timing(), this.panelInterface()));
  private previousUrl = '';
  protected readonly url = computed(() => {
    if (this.previousUrl) URL.revokeObjectURL(this.previousUrl);
    this.previousUrl = URL.createObjectURL(new Blob([this.svg()], { type: 'image/svg+xml' }));
    return this.previousUrl;
  });

  constructor() {
    inject(DestroyRef).onDestroy(() => this.previousUrl && URL.revokeObjectURL(this.previousUrl));
  }

  protected downloadSvg(): void {
    downloadText(`${this.timing().name}-timing.svg`, this.svg(), 'image/svg+xml');
  }
}
