import { ChangeDetectionStrategy, Component, computed, inject, input, linkedSignal, resource } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import type { PanelInterface } from '@shared/drive/interface';
import { BUILT_IN_PRESETS } from '@shared/model/panel-types';
import { ArtworkApi } from '../artworks/artwork-api';
import { PresetApi } from '../presets/preset-api';
import { StudioContext } from '../studio/studio-context';
import { FrameDataExport } from './frame-data-export';

/** Frame data on the drive timing page: which artwork, through which look, for the timing's interface. */
@Component({
  selector: 'em-frame-data-card',
  imports: [RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatProgressBarModule, MatSelectModule, FrameDataExport],
  template: `
    @if (artworks.hasValue() && artworks.value().length === 0) {
      <h2>Frame data</h2>
      <p class="empty">Frame data is packed from artwork in the studio's library, and the library is empty.</p>
      <a mat-stroked-button routerLink="../artworks"><mat-icon>photo_library</mat-icon> Go to artworks</a>
    } @else {
      @if (params(); as look) {
        <em-frame-data-export [image]="image()" [params]="look" [panelInterface]="panelInterface()" [name]="fileName()">
          <div class="source" role="group" aria-label="What to pack">
            <mat-form-field appearance="outline" subscriptSizing="dynamic">
              <mat-label>Artwork</mat-label>
              <mat-select [value]="artworkId()" (selectionChange)="artworkId.set($event.value)">
                @for (a of artworks.hasValue() ? artworks.value() : []; track a.id) {
                  <mat-option [value]="a.id">{{ a.name }}</mat-option>
                }
              </mat-select>
            </mat-form-field>
            @if (frameCount() > 1) {
              <mat-form-field appearance="outline" subscriptSizing="dynamic">
                <mat-label>Animation frame</mat-label>
                <mat-select [value]="frame()" (selectionChange)="frame.set($event.value)">
                  @for (k of frameNumbers(); track k) {
                    <mat-option [value]="k">{{ k + 1 }} of {{ frameCount() }}</mat-option>
                  }
                </mat-select>
              </mat-form-field>
            }
            <mat-form-field appearance="outline" subscriptSizing="dynamic">
              <mat-label>Look</mat-label>
              <mat-select [value]="lookId()" (selectionChange)="lookId.set($event.value)">
                @if (ownPresets().length) {
                  <mat-optgroup label="Studio presets">
                    @for (p of ownPresets(); track p.id) {
                      <mat-option [value]="'studio:' + p.id">{{ p.name }} · r{{ p.revision }}</mat-option>
                    }
                  </mat-optgroup>
                }
                <mat-optgroup label="Built-in">
                  @for (p of builtIns(); track p.id) {
                    <mat-option [value]="p.id">{{ p.name }}</mat-option>
                  }
                </mat-optgroup>
              </mat-select>
            </mat-form-field>
          </div>
          @if (frames.isLoading()) {
            <mat-progress-bar mode="indeterminate" aria-label="Loading the artwork" />
          }
          @if (frames.error()) {
            <p class="error" role="alert">The artwork could not be loaded: {{ frames.error() }}</p>
          }
        </em-frame-data-export>
      }
    }
  `,
  styles: `
    :host {
      display: block;
    }
    h2 {
      font: var(--mat-sys-title-large);
      margin-bottom: 8px;
    }
    .empty {
      color: var(--mat-sys-on-surface-variant);
    }
    .source {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(220px, 1fr));
      gap: 12px;
      margin-bottom: 16px;
    }
    .error {
      color: var(--mat-sys-error);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FrameDataCard {
  private readonly artworkApi = inject(ArtworkApi);
  private readonly presetApi = inject(PresetApi);
  private readonly context = inject(StudioContext);

  readonly panelTypeId = input.required<string>();
  readonly panelInterface = input<PanelInterface>();
  /** The timing's name, for the file. */
  readonly timingName = input('');

  protected readonly artworks = resource({ params: () => this.context.studioId(), loader: ({ params }) => this.artworkApi.list(params) });
  protected readonly artworkId = linkedSignal(() => (this.artworks.hasValue() ? this.artworks.value()[0]?.id : undefined));
  protected readonly artwork = computed(() =>
    this.artworks.hasValue() ? this.artworks.value().find((a) => a.id === this.artworkId()) : undefined,
  );
  protected readonly frames = resource({ params: () => this.artwork(), loader: ({ params }) => this.artworkApi.frames(params) });
  protected readonly frameCount = computed(() => this.artwork()?.frameCount ?? 0);
  protected readonly frameNumbers = computed(() => Array.from({ length: this.frameCount() }, (_, k) => k));
  protected readonly frame = linkedSignal({ source: this.artwork, computation: () => 0 });
  protected readonly image = computed(() => (this.frames.hasValue() ? this.frames.value()[this.frame()]?.image : undefined));

  private readonly studioPresets = resource({
    params: () => ({ studioId: this.context.studioId(), panelTypeId: this.panelTypeId() }),
    loader: ({ params }) =>
      this.presetApi.list(params.studioId, { panelTypeId: params.panelTypeId, pageSize: 100, sort: 'name' }).then((r) => r.presets),
  });
  protected readonly ownPresets = computed(() =>
    this.studioPresets.hasValue() ? this.studioPresets.value().filter((p) => p.panelTypeId === this.panelTypeId()) : [],
  );
  protected readonly builtIns = computed(() => BUILT_IN_PRESETS.filter((p) => p.panelTypeId === this.panelTypeId()));
  /** A built-in preset id, or "studio:<id>"; back to the panel type's first look when the type changes. */
  protected readonly lookId = linkedSignal(() => this.builtIns()[0]?.id ?? '');
  protected readonly params = computed(() => {
    const id = this.lookId();
    const chosen = id.startsWith('studio:')
      ? this.ownPresets().find((p) => `studio:${p.id}` === id)
      : this.builtIns().find((p) => p.id === id);
    return (chosen ?? this.builtIns()[0])?.parameters;
  });
  protected readonly fileName = computed(() => [this.artwork()?.name, this.timingName()].filter(Boolean).join(' ') || 'frame data');
}
