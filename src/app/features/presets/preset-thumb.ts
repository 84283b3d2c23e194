import { ChangeDetectionStrategy, Component, computed, input, signal } from '@angular/core';

/**
 * A preset's list thumbnail: a small server render (≤ 160 px), made once per revision and cached
 * by the browser under a URL that names the revision.
 */
@Component({
  selector: 'em-preset-thumb',
  template: `
    @if (src(); as url) {
      @if (!failed()) {
        <img [src]="url" [alt]="label()" [style.max-width.px]="maxWidth()" loading="lazy" (error)="failed.set(true)" />
      } @else {
        <span class="placeholder" role="img" [attr.aria-label]="'No render of ' + label()">—</span>
      }
    } @else {
      <span class="placeholder" role="img" aria-label="No artwork to render on">—</span>
    }
  `,
  styles: `
    :host {
      display: inline-block;
    }
    img {
      display: block;
      width: 100%;
      height: auto;
      border-radius: 4px;
      background: var(--mat-sys-surface-container-lowest);
    }
    .placeholder {
      display: grid;
      place-items: center;
      width: 96px;
      height: 64px;
      color: var(--mat-sys-on-surface-variant);
      background: var(--mat-sys-surface-container-lowest);
      border-radius: 4px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PresetThumb {
  readonly studioId = input.required<string>();
  readonly presetId = input.required<string>();
  readonly revision = input.required<number>();
  readonly artworkId = input<string | undefined>();
  readonly label = input('Reference render');
  readonly maxWidth = input(160);

  protected readonly failed = signal(false);
  protected readonly src = computed(() => {
    const artwork = this.artworkId();
    if (!artwork) return null;
    return `/api/studios/${this.studioId()}/presets/${this.presetId()}/thumbnail?artworkId=${artwork}&revision=${this.revision()}`;
  });
}
