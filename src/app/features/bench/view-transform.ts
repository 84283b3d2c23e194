import { mat3, vec2 } from 'gl-matrix';

/**
 * The preview's view: where the output image (its pixels) lands in the visible box (CSS pixels),
 * as one gl-matrix mat3 — a scale, then a translation. The same matrix places every layer (the
 * live canvas, the compared looks, the divider) and, inverted, turns a pointer into an image
 * pixel and so into a panel cell.
 */
export interface ViewState {
  /** The user's zoom on top of the mode's own scale (Fit, 1 : 1 pixels, Real size). */
  zoom: number;
  /** Where the image's top-left corner is in the box, CSS px. */
  x: number;
  y: number;
}

export interface Size {
  width: number;
  height: number;
}

export const ZOOM_LIMITS = { min: 0.25, max: 32 } as const;
/** Of the image, at least this much (CSS px) stays in the box however it is dragged. */
const KEEP_VISIBLE = 48;

/** The view a mode opens on: the image at the mode's scale, centred in the box where it is smaller. */
export function homeView(image: Size, box: Size, base: number): ViewState {
  return {
    zoom: 1,
    x: Math.max(0, (box.width - image.width * base) / 2),
    y: Math.max(0, (box.height - image.height * base) / 2),
  };
}

/** Image pixels → box CSS pixels. */
export function viewMatrix(base: number, view: ViewState): mat3 {
  const m = mat3.fromTranslation(mat3.create(), [view.x, view.y]);
  const k = base * view.zoom;
  return mat3.scale(m, m, [k, k]);
}

/** The image pixel under a point of the box (CSS px from its top-left), or null when the matrix cannot be inverted. */
export function imagePointAt(m: mat3, x: number, y: number): vec2 | null {
  const inverse = mat3.invert(mat3.create(), m);
  if (!inverse) return null;
  return vec2.transformMat3(vec2.create(), [x, y], inverse);
}

/** Zooms by a factor about a point of the box, which stays over the same image pixel. */
export function zoomAround(view: ViewState, factor: number, x: number, y: number): ViewState {
  const zoom = Math.min(ZOOM_LIMITS.max, Math.max(ZOOM_LIMITS.min, view.zoom * factor));
  const applied = zoom / view.zoom;
  return { zoom, x: x - (x - view.x) * applied, y: y - (y - view.y) * applied };
}

/** Keeps some of the image in the box, so a drag or a zoom never loses it. */
export function clampView(view: ViewState, image: Size, box: Size, base: number): ViewState {
  const w = image.width * base * view.zoom;
  const h = image.height * base * view.zoom;
  const keepX = Math.min(KEEP_VISIBLE, w);
  const keepY = Math.min(KEEP_VISIBLE, h);
  return {
    zoom: view.zoom,
    x: Math.min(box.width - keepX, Math.max(keepX - w, view.x)),
    y: Math.min(box.height - keepY, Math.max(keepY - h, view.y)),
  };
}

/** The matrix as a CSS transform (origin at the top-left). */
export function cssTransform(m: mat3): string {
  return `matrix(${m[0]}, ${m[1]}, ${m[3]}, ${m[4]}, ${m[6]}, ${m[7]})`;
}
