import { chromaticityToXyz, emissionColour, spectrumToXyz, type EmissionBand } from '../../color/emission';
import { REC709 } from '../../color/srgb';
import { LINE_CENTRED_BELOW_PX, type PanelParams } from '../../model/parameters';
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
  /** CRT: each line's centre moved onto the centre of the pixel row it falls in (else area-true). */
  lineCentred: boolean;
  /** Share of light leaving the cell directly (1 − glow − halo). */
  directShare: number;
  /** Glow grid samples per cell. */
  glowOversample: number;
  /** Emission colour, linear sRGB after the gamut rule, scaled to luminance 1; and that luminance (1). */
  colour: [number, number, number];
  colourY: number;
  /** Display linear = (colour·(v·peak + off) + Y_c·ambient) · gain, with Y_c = 1: a full cell shows `peak`. */
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

/** The output uniforms of a parameter set at `scale` output pixels per cell pitch. */
export function outputUniforms(p: PanelParams, scale: number): OutputUniforms {
  const cellW = scale;
  const cellH = (scale * p.cell.pitchYMm) / p.cell.pitchXMm;
  const xyz =
    p.emission.colourSource === 'spectrum'
      ? spectrumToXyz(emissionBands(p.emission))
      : chromaticityToXyz(p.emission.chromaX, p.emission.chromaY);
  // Luminance 1, so peakCdM2 is the luminance of a lit cell for every colour (Rec. 709 weights on linear sRGB [std]).
  const gamutMapped = emissionColour(xyz).rgb;
  const y = REC709[0] * gamutMapped[0] + REC709[1] * gamutMapped[1] + REC709[2] * gamutMapped[2];
  const colour = gamutMapped.map((c) => c / y) as [number, number, number];
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
    lineCentred:
      p.cell.mode === 'crt' && (p.cell.lineSampling === 'centred' || (p.cell.lineSampling === 'auto' && cellH < LINE_CENTRED_BELOW_PX)),
    directShare: 1 - (plan.glow.share + plan.halo.share),
    glowOversample: plan.oversample,
    colour,
    colourY: 1,
    peakCdM2: p.viewing.peakCdM2,
    offCdM2: p.viewing.offCdM2,
    ambientCdM2: p.viewing.ambientCdM2,
    gain: 2 ** p.viewing.exposureEv / p.viewing.whiteCdM2,
    knee: p.viewing.knee,
  };
}
