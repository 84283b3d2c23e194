import { ChangeDetectionStrategy, Component, inject, input, resource, signal } from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { panelTypeById } from '@shared/model/panel-types';
import { PARAMS } from '@shared/model/parameters';
import type { Frame } from '@shared/pipeline/types';
import { apiErrorMessage } from '../../core/api-error';
import { PanelPreview } from '../bench/panel-preview';
import { PresetApi } from '../presets/preset-api';
import { ShareHeader } from './share-header';

const DITHER = PARAMS.find((p) => p.group === 'drive' && p.key === 'dither')!;

/** What a share link opens: the preset on its artwork, read-only, no account needed. */
@Component({
  selector: 'em-shared-view',
  imports: [MatProgressBarModule, ShareHeader, PanelPreview],
  templateUrl: './shared-view.html',
  styleUrl: './shared-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedView {
  private readonly api = inject(PresetApi);

  readonly token = input.required<string>();

  protected readonly shared = resource({ params: () => this.token(), loader: ({ params }) => this.api.shared(params) });
  protected readonly frames = resource({
    params: () => (this.shared.hasValue() && this.shared.value().framesUrl ? this.shared.value() : undefined),
    loader: ({ params }): Promise<Frame[]> => this.api.sharedFrames(params),
  });
  protected readonly drawn = signal(false);
  protected readonly problem = signal('');
  protected readonly typeName = (id: string) => panelTypeById(id)?.name ?? id;
  /** A dither as the bench names it. */
  protected readonly ditherName = (id: string) => ('optionLabels' in DITHER ? DITHER.optionLabels[id] : undefined) ?? id;
  protected readonly errorText = () => apiErrorMessage(this.shared.error());
}
