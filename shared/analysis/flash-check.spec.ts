import { builtInPresetById } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import type { Frame } from '../pipeline/types';
import { flashCheck } from './flash-check';

/** A flat mid-grey still (sRGB code 188 ≈ half the light), one frame. */
function grey(cols: number, rows: number): Frame[] {
  const data = new Uint8Array(cols * rows * 4);
  for (let i = 0; i < cols * rows; i++) data.set([188, 188, 188, 255], i * 4);
  return [{ image: { width: cols, height: rows, data }, delayMs: 100 }];
}

/** On/off cells, 30 Hz frame-rate control over 2 refreshes at 60 Hz, no afterglow: each half-lit cell blinks. */
const look = (dither: PanelParams['drive']['dither']): PanelParams =>
  mergeParams(builtInPresetById('el-amber-640x480.standard')!.parameters, {
    cell: { cols: 64, rows: 64, pitchXMm: 0.3, pitchYMm: 0.3 },
    source: { fit: 'native' },
    drive: { grayLevels: 2, dither, refreshHz: 60, rowLoading: 0 },
    emission: { decayMs: 0 },
  });

describe('the flash check sees frame-rate control flicker (WCAG 2.2 2.3.1 [std])', () => {
  // A 0.1° block is 2·d·tan(0.05°): 0.26 mm at 150 mm (one 0.3 mm cell), 0.61 mm at 350 mm (two cells).
  test('close up, where a 0.1° block is one cell, a half-lit field blinking at 30 Hz fails; without FRC the still has nothing to flash [calc]', () => {
    const frc = flashCheck(grey(64, 64), look('frc2'), 150);
    expect(frc.block.cols).toBe(64);
    expect(frc.frc).toEqual({ refreshes: 2, refreshHz: 60, framesChecked: 1 });
    expect(frc.maxFlashesPerSecond).toBeGreaterThanOrEqual(25);
    expect(frc.generalFlashFail).toBe(true);
    expect(frc.pass).toBe(false);
    const still = flashCheck(grey(64, 64), look('floyd-steinberg'), 150);
    expect(still.frc).toBeUndefined();
    expect(still.maxFlashesPerSecond).toBe(0);
    expect(still.pass).toBe(true);
  });

  test('from farther away, where a block holds 2 × 2 cells out of step, the block light is steady and the check passes [calc]', () => {
    const frc = flashCheck(grey(64, 64), look('frc2'), 350);
    expect(frc.block.cols).toBe(32);
    expect(frc.maxFlashesPerSecond).toBe(0);
    expect(frc.pass).toBe(true);
  });
});
