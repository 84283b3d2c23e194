import { mat3, vec3 } from 'gl-matrix';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
export { MARK_NAMES } from './pattern';

export type Point = [number, number];

import { MARK_NAMES } from './pattern';

/** A 3 × 3 plane-to-plane mapping (gl-matrix mat3, column-major) and its inverse. */
export interface Homography {
  forward: mat3;
  inverse: mat3;
}

/** Translates and scales points to mean 0 and mean distance √2 (Hartley's normalisation), as a matrix and the moved points. */
function normalising(points: readonly Point[]): { t: Matrix; moved: Point[] } {
  const n = points.length;
  const mx = points.reduce((s, p) => s + p[0], 0) / n;
  const my = points.reduce((s, p) => s + p[1], 0) / n;
  const d = points.reduce((s, p) => s + Math.hypot(p[0] - mx, p[1] - my), 0) / n;
  const k = Math.SQRT2 / (d || 1);
  return {
    t: new Matrix([
      [k, 0, -k * mx],
      [0, k, -k * my],
      [0, 0, 1],
    ]),
    moved: points.map(([x, y]) => [k * (x - mx), k * (y - my)]),
  };
}

/**
 * The homography H with dst ≃ H·src, by the normalised direct linear transform (Hartley &
 * Zisserman, "Multiple View Geometry", algorithm 4.2): two rows of A per correspondence, h the
 * right singular vector of A's smallest singular value. Four or more point pairs, no three collinear.
 */
export function solveHomography(src: readonly Point[], dst: readonly Point[]): Homography {
  if (src.length !== dst.length || src.length < 4) throw new RangeError('a homography needs at least four point pairs');
  const a = normalising(src);
  const b = normalising(dst);
  const rows: number[][] = [];
  a.moved.forEach(([x, y], i) => {
    const [u, v] = b.moved[i];
    rows.push([-x, -y, -1, 0, 0, 0, u * x, u * y, u]);
    rows.push([0, 0, 0, -x, -y, -1, v * x, v * y, v]);
  });
  // Pad to a square system: the null vector is the same, and the decomposition needs rows ≥ columns.
  while (rows.length < 9) rows.push(new Array(9).fill(0));
  const svd = new SingularValueDecomposition(new Matrix(rows));
  const v = svd.rightSingularVectors;
  const s = svd.diagonal;
  const smallest = s.indexOf(Math.min(...s));
  const hn = new Matrix(3, 3);
  for (let k = 0; k < 9; k++) hn.set(Math.floor(k / 3), k % 3, v.get(k, smallest));
  // Undo the normalisations: H = Tb⁻¹ · Hn · Ta.
  const h = inverse3(b.t).mmul(hn).mmul(a.t);
  const scale = h.get(2, 2);
  const values = h.to1DArray().map((x) => x / scale);
  const forward = mat3.fromValues(values[0], values[3], values[6], values[1], values[4], values[7], values[2], values[5], values[8]);
  const inverse = mat3.create();
  if (!mat3.invert(inverse, forward)) throw new RangeError('the points do not span a plane (no three may lie on one line)');
  return { forward, inverse };
}

/** The inverse of a 3 × 3 ml-matrix (through gl-matrix, which inverts 3 × 3 in closed form). */
function inverse3(m: Matrix): Matrix {
  const g = mat3.fromValues(
    m.get(0, 0),
    m.get(1, 0),
    m.get(2, 0),
    m.get(0, 1),
    m.get(1, 1),
    m.get(2, 1),
    m.get(0, 2),
    m.get(1, 2),
    m.get(2, 2),
  );
  mat3.invert(g, g);
  return new Matrix([
    [g[0], g[3], g[6]],
    [g[1], g[4], g[7]],
    [g[2], g[5], g[8]],
  ]);
}

/** Applies a homography matrix to a point (homogeneous divide included). */
export function applyHomography(m: mat3, x: number, y: number): Point {
  const p = vec3.transformMat3(vec3.create(), vec3.fromValues(x, y, 1), m);
  return [p[0] / p[2], p[1] / p[2]];
}

/** A mark placement that cannot be used, with what to do about it. */
export class MarkError extends Error {}

/**
 * Checks four marks (photo pixels, in MARK_NAMES order) before anything is fitted: inside the
 * photo, apart, no three on one line, and going round the panel clockwise as the photo shows it.
 */
export function checkMarks(marks: readonly Point[], width: number, height: number): void {
  if (marks.length !== 4) throw new MarkError(`Place exactly four marks, one on each corner square; got ${marks.length}.`);
  marks.forEach(([x, y], i) => {
    if (!Number.isFinite(x) || !Number.isFinite(y) || x < 0 || y < 0 || x > width || y > height) {
      throw new MarkError(
        `The ${MARK_NAMES[i]} mark is outside the photo (${width} × ${height} px). Drag it onto the ${MARK_NAMES[i]} corner square.`,
      );
    }
  });
  const span = Math.max(...marks.flatMap((p) => marks.map((q) => Math.hypot(p[0] - q[0], p[1] - q[1]))));
  for (let i = 0; i < 4; i++) {
    for (let j = i + 1; j < 4; j++) {
      if (Math.hypot(marks[i][0] - marks[j][0], marks[i][1] - marks[j][1]) < Math.max(8, span * 0.05)) {
        throw new MarkError(`The ${MARK_NAMES[i]} and ${MARK_NAMES[j]} marks are on top of each other. Put each on its own corner square.`);
      }
    }
  }
  // No three on one line: each mark at least 2 % of the span away from the line through two others.
  for (let k = 0; k < 4; k++) {
    const [a, b, c] = [0, 1, 2, 3].filter((i) => i !== k).map((i) => marks[i]);
    for (const [p, q, r] of [
      [a, b, c],
      [b, c, a],
      [c, a, b],
    ] as const) {
      const cross = (q[0] - p[0]) * (r[1] - p[1]) - (q[1] - p[1]) * (r[0] - p[0]);
      if (Math.abs(cross) / Math.hypot(q[0] - p[0], q[1] - p[1]) < span * 0.02) {
        throw new MarkError(
          'Three of the marks lie on one line, so they cannot be the corners of the panel. Place each on its own corner square of the pattern.',
        );
      }
    }
  }
  // Clockwise on screen (y down): every turn of the outline has a positive cross product.
  const turns = marks.map((p, i) => {
    const q = marks[(i + 1) % 4];
    const r = marks[(i + 2) % 4];
    return Math.sign((q[0] - p[0]) * (r[1] - q[1]) - (q[1] - p[1]) * (r[0] - q[0]));
  });
  if (turns.every((t) => t < 0))
    throw new MarkError(
      'The marks go round the panel anticlockwise. Place them top-left, top-right, bottom-right, bottom-left, as the corner squares appear on the panel.',
    );
  if (!turns.every((t) => t > 0))
    throw new MarkError(
      'The marks are out of order: their outline crosses itself. Place them top-left, top-right, bottom-right, bottom-left.',
    );
}
