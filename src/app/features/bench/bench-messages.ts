import type { PanelParams } from '@shared/model/parameters';
import type { FlashSafety } from '@shared/analysis/flash-safety';
import type { PanelReport } from '@shared/analysis/panel-report';
import type { Field, Frame, RgbaImage } from '@shared/pipeline/types';

/** Page → worker. */
export type WorkerRequest =
  | { type: 'frames'; frames: Frame[] }
  | { type: 'render'; id: number; params: PanelParams; frame: number; scale: number; compose: boolean }
  | { type: 'flash'; id: number; params: PanelParams; distanceMm: number }
  | { type: 'cycle'; id: number; params: PanelParams; frame: number }
  | { type: 'report'; id: number; params: PanelParams; frame: number; hours: number };

/** Worker → page. */
export type WorkerResult =
  | { type: 'result'; id: number; emission: Float32Array; glow: Field; image?: RgbaImage; ms: number }
  | { type: 'flash'; id: number; report: FlashSafety; ms: number }
  | { type: 'cycle'; id: number; emissions: Float32Array[]; ms: number }
  | { type: 'report'; id: number; report: PanelReport; lostCells: Uint8Array; wear: Float32Array; ms: number }
  | { type: 'error'; id: number; message: string };
