import { chromaticityToXyz, emissionColour, spectrumToXyz, type EmissionBand } from '../../color/emission';
import { REC709 } from '../../color/srgb';
import type { PanelParams } from '../../model/parameters';
import { glowPlan } from '../glow/glow';

/**
 * Everything the output-resolution stages need, computed once from the parameters: the CPU
 * composer and the WebGL shader both read these, so they cannot disagree on a constant.
 */
export interface OutputUniforms {
  cols: number;
  rows: number;
  /** Output pixels per cell across and down (down = across × pitchY/pitchX). */
  cellW: number;
  cellH: number;
  width: number;
  height: number;
  fillX: number;
  fillY: number;
  crt: boolean;
  /** CRT line profile σ in output pixels. */
  spotSigmaPx: number;
  /** Share of light leaving the cell directly (1 − glow − halo). */
  directShare: number;
  /** Glow grid samples per cell. */
  glowOversample: number;
  /** Emission colour, linear sRGB after the gamut rule, largest channel 1; and its luminance. */
  colour: [number, number, number];
  colourY: number;
  /** Display linear = (colour·(v·peak + off) + Y_c·ambient) · gain. */
  peakCdM2: number;
  offCdM2: number;
  ambientCdM2: number;
  gain: number;
  knee: number;
}

/** The emission bands a spectrum-coloured parameter set describes. */
export function emissionBands(e: PanelParams['emission']): EmissionBand[] {
  const bands = [{ peakNm: e.peak1Nm, fwhmNm: e.fwhm1Nm, weight: 1 }];
  if (e.band2Weight > 0) bands.push({ peakNm: e.peak2Nm, fwhmNm: e.fwhm2Nm, weight: e.band2Weight });
  return bands;
}

export function outputUniforms(p: PanelParams, scale: number): OutputUniforms {
  const cellW = scale;
  const cellH = (scale * p.cell.pitchYMm) / p.cell.pitchXMm;
  const xyz = p.emission.colourSource === 'spectrum' ? spectrumToXyz(emissionBands(p.emission)) : chromaticityToXyz(p.emission.chromaX, p.emission.chromaY);
  const colour = emissionColour(xyz).rgb;
  const plan = glowPlan(p.cell, p.glass);
  return {
    cols: p.cell.cols,
    rows: p.cell.rows,
    cellW,
    cellH,
    width: Math.round(p.cell.cols * cellW),
    height: Math.round(p.cell.rows * cellH),
    fillX: p.cell.fillX,
    fillY: p.cell.fillY,
    crt: p.cell.mode === 'crt',
    spotSigmaPx: p.cell.spotSigma * cellH,
    directShare: 1 - (plan.glow.share + plan.halo.share),
    glowOversample: plan.oversample,
    colour,
    colourY: REC709[0] * colour[0] + REC709[1] * colour[1] + REC709[2] * colour[2],
    peakCdM2: p.viewing.peakCdM2,
    offCdM2: p.viewing.offCdM2,
    ambientCdM2: p.viewing.ambientCdM2,
    gain: 2 ** p.viewing.exposureEv / p.viewing.whiteCdM2,
    knee: p.viewing.knee,
  };
}
