import { CIE_END_NM, CIE_START_NM, CIE_X, CIE_Y, CIE_Z } from '../color/cie1931';

/**
 * For tests: the chromaticity of one Gaussian emission band, written out from the CIE 1931 2°
 * table (data only) without the pipeline's colour code, so a test's expected value is not the
 * code's own output: x = X / (X + Y + Z), with X = Σ x̄(λ) · exp(−(λ − peak)² / 2σ²) at 1 nm and
 * σ = FWHM / 2√(2 ln 2) [std: CIE 015 colorimetry; calc].
 */
export function bandChromaticity(peakNm: number, fwhmNm: number): { x: number; y: number } {
  const sigma = fwhmNm / (2 * Math.sqrt(2 * Math.log(2)));
  let [X, Y, Z] = [0, 0, 0];
  for (let nm = CIE_START_NM; nm <= CIE_END_NM; nm++) {
    const s = Math.exp(-((nm - peakNm) ** 2) / (2 * sigma * sigma));
    const k = nm - CIE_START_NM;
    X += s * CIE_X[k];
    Y += s * CIE_Y[k];
    Z += s * CIE_Z[k];
  }
  return { x: X / (X + Y + Z), y: Y / (X + Y + Z) };
}
