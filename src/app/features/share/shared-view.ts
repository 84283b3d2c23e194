import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  effect,
  ElementRef,
  inject,
  input,
  resource,
  signal,
  viewChild,
} from '@angular/core';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { panelTypeById } from '@shared/model/panel-types';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import type { Frame } from '@shared/pipeline/types';
import { apiErrorMessage } from '../../core/api-error';
import { PanelRenderer } from '../../render/panel-renderer';
import { BenchEngine } from '../bench/bench-engine';
import { PresetApi } from '../presets/preset-api';
import { ShareHeader } from './share-header';

/** What a share link opens: the preset on its artwork, read-only, no account needed. */
@Component({
  selector: 'em-shared-view',
  imports: [MatProgressBarModule, ShareHeader],
  templateUrl: './shared-view.html',
  styleUrl: './shared-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SharedView {
  private readonly api = inject(PresetApi);
  private readonly engine = new BenchEngine();

  readonly token = input.required<string>();

  private readonly canvas = viewChild<ElementRef<HTMLCanvasElement>>('canvas');
  private readonly cpuCanvas = viewChild<ElementRef<HTMLCanvasElement>>('cpuCanvas');
  protected readonly shared = resource({ params: () => this.token(), loader: ({ params }) => this.api.shared(params) });
  protected readonly frames = resource({
    params: () => (this.shared.hasValue() && this.shared.value().framesUrl ? this.shared.value() : undefined),
    loader: ({ params }): Promise<Frame[]> => this.api.sharedFrames(params),
  });
  protected readonly drawn = signal(false);
  protected readonly usingCpu = signal(false);
  protected readonly typeName = (id: string) => panelTypeById(id)?.name ?? id;
  protected readonly errorText = () => apiErrorMessage(this.shared.error());

  constructor() {
    inject(DestroyRef).onDestroy(() => this.engine.dispose());
    effect(() => void this.draw());
  }

  private async draw(): Promise<void> {
    if (!this.frames.hasValue() || !this.shared.hasValue() || !this.canvas()) return;
    const params = this.shared.value().preset.parameters;
    this.engine.setFrames(this.frames.value());
    const gl = PanelRenderer.create(this.canvas()!.nativeElement);
    this.usingCpu.set(!gl);
    const result = await this.engine.render(params, 0, 2, !gl);
    if (!result) return;
    if (gl) {
      gl.upload(result.emission, params.cell.cols, params.cell.rows, result.glow);
      gl.draw(outputUniforms(params, 2));
    } else if (result.image) {
      const c = this.cpuCanvas()!.nativeElement;
      c.width = result.image.width;
      c.height = result.image.height;
      c.getContext('2d')!.putImageData(
        new ImageData(new Uint8ClampedArray(result.image.data.buffer as ArrayBuffer), result.image.width, result.image.height),
        0,
        0,
      );
    }
    this.drawn.set(true);
  }
}
