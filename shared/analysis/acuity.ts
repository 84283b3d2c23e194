/**
 * Viewing distance and what the eye resolves [std: ISO 8596 — at decimal visual acuity 1.0
 * ("20/20") the gap of the Landolt ring subtends 1 minute of arc, the minimum angle of
 * resolution]. The cell structure counts as resolvable when one cell pitch subtends at least that
 * angle; finer cells blend into a continuous picture. Angles are exact (2·atan(s / 2d)), not the
 * small-angle approximation, so they hold at any distance.
 */

/** The minimum angle of resolution at decimal acuity 1.0, in minutes of arc [std ISO 8596]. */
export const MAR_20_20_ARCMIN = 1;

const ARCMIN_PER_RADIAN = (180 / Math.PI) * 60;

/** The angle a length `sizeMm` subtends, centred, at `distanceMm`, in minutes of arc. */
export function subtendedArcmin(sizeMm: number, distanceMm: number): number {
  return 2 * Math.atan(sizeMm / (2 * distanceMm)) * ARCMIN_PER_RADIAN;
}

export interface Acuity {
  /** Angle of one cell pitch. */
  arcminPerCell: number;
  /** Cells per degree of visual field. */
  cellsPerDegree: number;
  /** Whether 20/20 vision resolves the cell structure at this distance. */
  resolvable: boolean;
  /** Beyond this distance the cells blend (one pitch subtends less than 1′). */
  limitDistanceMm: number;
  /** The panel's visual angle (width, height, diagonal) in degrees, when its size is given. */
  panelDegrees: { width: number; height: number; diagonal: number } | null;
}

/** What a viewer at `distanceMm` sees of cells at `pitchMm` (and of a panel `widthMm` × `heightMm`, if given). */
export function acuity(pitchMm: number, distanceMm: number, panel?: { widthMm: number; heightMm: number }): Acuity {
  if (!(pitchMm > 0) || !(distanceMm > 0))
    throw new RangeError(`pitch and distance must be positive, got ${pitchMm} mm and ${distanceMm} mm`);
  const arcminPerCell = subtendedArcmin(pitchMm, distanceMm);
  const limitDistanceMm = pitchMm / (2 * Math.tan(MAR_20_20_ARCMIN / ARCMIN_PER_RADIAN / 2));
  const deg = (mm: number) => subtendedArcmin(mm, distanceMm) / 60;
  return {
    arcminPerCell,
    cellsPerDegree: 60 / arcminPerCell,
    resolvable: arcminPerCell >= MAR_20_20_ARCMIN,
    limitDistanceMm,
    panelDegrees: panel
      ? { width: deg(panel.widthMm), height: deg(panel.heightMm), diagonal: deg(Math.hypot(panel.widthMm, panel.heightMm)) }
      : null,
  };
}
