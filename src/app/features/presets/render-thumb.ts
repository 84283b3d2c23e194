import { ChangeDetectionStrategy, Component, inject, input, resource } from '@angular/core';
import type { PanelParams } from '@shared/model/parameters';
import { PresetApi } from './preset-api';

/** A server reference render of an artwork with some parameters, as an image (cached by the server). */
@Component({
  selector: 'em-render-thumb',
  template: `
    @if (render.hasValue()) {
      <img [src]="render.value()!.url" [alt]="label()" [style.max-width.px]="maxWidth()" />
    } @else if (render.isLoading()) {
      <span class="placeholder" role="img" [attr.aria-label]="'Rendering ' + label()">…</span>
    } @else {
      <span class="placeholder" role="img" aria-label="No render">—</span>
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
      image-rendering: pixelated;
      border-radius: 4px;
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
export class RenderThumb {
  private readonly api = inject(PresetApi);

  readonly studioId = input.required<string>();
  readonly artworkId = input<string | undefined>();
  readonly parameters = input.required<PanelParams>();
  readonly scale = input(1);
  readonly label = input('Reference render');
  readonly maxWidth = input(160);

  protected readonly render = resource({
    params: () =>
      this.artworkId()
        ? { studioId: this.studioId(), artworkId: this.artworkId()!, parameters: this.parameters(), scale: this.scale() }
        : undefined,
    loader: ({ params }) => this.api.render(params.studioId, params.artworkId, params.parameters, params.scale),
  });
}
