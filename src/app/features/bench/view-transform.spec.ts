import { clampView, cssTransform, homeView, imagePointAt, viewMatrix, zoomAround, ZOOM_LIMITS } from './view-transform';

const image = { width: 1280, height: 960 };
const box = { width: 800, height: 500 };

// gl-matrix keeps matrices in Float32Array: positions are checked to a thousandth of a pixel.
describe('the preview view transform (one mat3: image pixels → box CSS pixels)', () => {
  test('Fit opens centred: a 1280 × 960 image in an 800 × 500 box fits its height and sits 66.7 px from the left', () => {
    const base = Math.min(box.width / image.width, box.height / image.height);
    expect(base).toBeCloseTo(500 / 960, 12);
    const home = homeView(image, box, base);
    expect(home.y).toBe(0);
    expect(home.x).toBeCloseTo(66.667, 3);
    expect(home.x).toBeCloseTo((800 - 1280 * base) / 2, 9);
    // The image's far corner lands on the box's bottom edge.
    const m = viewMatrix(base, home);
    expect(m[0] * image.width + m[6]).toBeCloseTo(800 - home.x, 3);
    expect(m[4] * image.height + m[7]).toBeCloseTo(500, 3);
  });

  test('a pointer maps back to the image pixel under it through the inverted matrix', () => {
    const m = viewMatrix(0.5, { zoom: 3, x: -200, y: 40 });
    // Image pixel (300, 100) is at 300 × 1.5 − 200 = 250, 100 × 1.5 + 40 = 190.
    const p = imagePointAt(m, 250, 190)!;
    expect(p[0]).toBeCloseTo(300, 3);
    expect(p[1]).toBeCloseTo(100, 3);
  });

  test('zooming about the pointer keeps the same image pixel under it, and stops at the limits', () => {
    const before = { zoom: 1, x: 80, y: 0 };
    const at = imagePointAt(viewMatrix(0.5, before), 333, 222)!;
    const after = zoomAround(before, 2.5, 333, 222);
    expect(after.zoom).toBe(2.5);
    const still = imagePointAt(viewMatrix(0.5, after), 333, 222)!;
    expect(still[0]).toBeCloseTo(at[0], 3);
    expect(still[1]).toBeCloseTo(at[1], 3);
    expect(zoomAround(after, 1000, 0, 0).zoom).toBe(ZOOM_LIMITS.max);
    expect(zoomAround(after, 1e-6, 0, 0).zoom).toBe(ZOOM_LIMITS.min);
  });

  test('a drag never takes the whole image out of the box', () => {
    const far = clampView({ zoom: 2, x: 5000, y: -5000 }, image, box, 0.5);
    expect(far.x).toBe(box.width - 48);
    expect(far.y).toBe(48 - image.height);
    const near = { zoom: 2, x: -100, y: -50 };
    expect(clampView(near, image, box, 0.5)).toEqual(near);
  });

  test('the CSS transform is the matrix: scale then translate', () => {
    expect(cssTransform(viewMatrix(0.5, { zoom: 4, x: 10, y: -20 }))).toBe('matrix(2, 0, 0, 2, 10, -20)');
  });
});
