import type { PanelParams } from '../../../../shared/model/parameters';
import type { Field, Frame, RgbaImage } from '../../../../shared/pipeline/types';

/** Page → worker. */
export type WorkerRequest =
  | { type: 'frames'; frames: Frame[] }
  | { type: 'render'; id: number; params: PanelParams; frame: number; scale: number; compose: boolean };

/** Worker → page. */
export type WorkerResult =
  | { type: 'result'; id: number; emission: Float32Array; glow: Field; image?: RgbaImage; ms: number }
  | { type: 'error'; id: number; message: string };
