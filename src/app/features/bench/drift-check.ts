import { inject, Injectable } from '@angular/core';
import pixelmatch from 'pixelmatch';
import { pixelDiff } from '@shared/analysis/pixel-diff';
import type { PanelParams } from '@shared/model/parameters';
import { RenderApi } from './render-api';

/** How far the live view is from the server's reference render of the same view. */
export interface Drift {
  /** Share of pixels that differ at all. */
  share: number;
  pixels: number;
  /** The largest difference of one channel, in 8-bit codes. */
  maxChannel: number;
  /** Every differing pixel marked (pixelmatch at threshold 0), RGBA. */
  heatmap: { data: Uint8Array; width: number; height: number };
}

/** The drift check: asks the server for the reference render of a view and compares it with the live pixels. */
@Injectable({ providedIn: 'root' })
export class DriftCheck {
  private readonly renders = inject(RenderApi);

  async measure(
    studioId: string,
    view: { artworkId: string; parameters: PanelParams; scale: number; frame: number },
    live: { pixels: Uint8Array; width: number; height: number },
  ): Promise<Drift> {
    const render = await this.renders.render(studioId, view);
    const reference = await decodePng(await this.renders.png(render));
    const { width, height } = render;
    if (live.pixels.length !== reference.length)
      throw new Error(`the live view is ${live.width} × ${live.height} but the reference is ${width} × ${height}`);
    const heatmap = new Uint8Array(width * height * 4);
    pixelmatch(live.pixels, reference, heatmap, width, height, { threshold: 0 });
    const exact = pixelDiff(live.pixels, reference);
    return {
      share: exact.differing / exact.pixels,
      pixels: exact.differing,
      maxChannel: exact.maxChannel,
      heatmap: { data: heatmap, width, height },
    };
  }
}

/** Decodes a PNG without colour management, as stored. */
async function decodePng(blob: Blob): Promise<Uint8Array> {
  const bitmap = await createImageBitmap(blob, { colorSpaceConversion: 'none', premultiplyAlpha: 'none' });
  const canvas = new OffscreenCanvas(bitmap.width, bitmap.height);
  const ctx = canvas.getContext('2d')!;
  ctx.drawImage(bitmap, 0, 0);
  return new Uint8Array(ctx.getImageData(0, 0, bitmap.width, bitmap.height).data.buffer);
}
