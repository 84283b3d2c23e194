import sharp from 'sharp';
import { extendedBox, extendedBoxVariance, gaussianBlur } from './blur';
import { apertureShare, fluxField, glowField, glowPlan, haloRadiusFromGlass, ringOffsets, ringRows } from './glow';
import { PANEL_TYPES } from '../../model/panel-types';

describe('extended box cascade', () => {
  test.each([0.3, 0.8, 1.5, 2.7, 5, 12.5])(
    'three passes at σ = %f have variance exactly σ² [paper] Gwosdek et al. 2011, from memory; [calc]',
    (sigma) => {
      const { r, alpha } = extendedBox(sigma);
      expect(3 * extendedBoxVariance(r, alpha)).toBeCloseTo(sigma * sigma, 9);
      expect(alpha).toBeGreaterThanOrEqual(0);
      expect(alpha).toBeLessThan(1);
    },
  );

  test('an impulse blurred far from the edges keeps its energy and its variance is σ² per axis [calc]', () => {
    const w = 101;
    const data = new Float32Array(w * w);
    data[50 * w + 50] = 1;
    const out = gaussianBlur(data, w, w, 4, 2.5);
    let sum = 0;
    let vx = 0;
    let vy = 0;
    for (let y = 0; y < w; y++)
      for (let x = 0; x < w; x++) {
        const v = out[y * w + x];
        sum += v;
        vx += v * (x - 50) ** 2;
        vy += v * (y - 50) ** 2;
      }
    expect(sum).toBeCloseTo(1, 5);
    expect(vx).toBeCloseTo(16, 3);
    expect(vy).toBeCloseTo(6.25, 3);
  });

  // Independent reference: libvips' Gaussian via sharp (minAmplitude 0.001, float precision).
  // Both see an 8-bit pattern far from the edges. Tolerance: worst pixel 6/255 (2.4 % of full
  // scale: three boxes are a Gaussian of the right variance, not of exactly its shape, plus
  // sharp's 8-bit rounding) and mean absolute difference 0.75/255.
  test.each([1.5, 3, 6])(
    'matches sharp/libvips blur(σ = %f) on a bar and square pattern [calc] against the sharp/libvips library',
    async (sigma) => {
      const w = 96;
      const src = new Uint8Array(w * w);
      for (let y = 30; y < 66; y++)
        for (let x = 30; x < 66; x++) if (x < 40 || (x > 50 && x < 53) || (y > 58 && x > 56)) src[y * w + x] = 255;
      const ref = await sharp(src, { raw: { width: w, height: w, channels: 1 } })
        .blur({ sigma, minAmplitude: 0.001, precision: 'float' })
        .toColourspace('b-w')
        .raw()
        .toBuffer();
      const ours = gaussianBlur(Float32Array.from(src), w, w, sigma, sigma);
      let worst = 0;
      let total = 0;
      for (let i = 0; i < ours.length; i++) {
        const d = Math.abs(ours[i] - ref[i]);
        worst = Math.max(worst, d);
        total += d;
      }
      expect(worst).toBeLessThanOrEqual(6);
      expect(total / ours.length).toBeLessThanOrEqual(0.75);
    },
  );
});

describe('glass', () => {
  test('halation ring radius r = 2·t·tan(asin(1/n)): n = 1.52 → 1.747·t [mem] classical CRT faceplate optics', () => {
    expect(haloRadiusFromGlass(1, 1.52)).toBeCloseTo(1.747, 3);
    expect(haloRadiusFromGlass(10, 1.52)).toBeCloseTo(17.47, 2);
  });

  test('a glow narrower than 1.5 cells is computed on an oversampled grid [calc] the model’s sampling rule', () => {
    const el = PANEL_TYPES[0].defaults;
    const plan = glowPlan(el.cell, { ...el.glass, glowRadiusMm: 0.3 * 0.5 });
    expect(plan.oversample).toBe(3);
    expect(plan.glow.sigmaX).toBeCloseTo(1.5, 9);
    expect(glowPlan(el.cell, { ...el.glass, glowRadiusMm: 3, haloRadiusMm: 6 }).oversample).toBe(1);
  });

  test('the flux field holds each cell’s light times its aperture area [calc]', () => {
    const cell = { ...PANEL_TYPES[0].defaults.cell, cols: 3, rows: 2, fillX: 0.5, fillY: 0.75 };
    const flux = fluxField(new Float32Array([1, 0, 0.5, 0, 0, 1]), cell, 4);
    const total = flux.data.reduce((a, b) => a + b, 0) / 16;
    expect(total).toBeCloseTo((1 + 0.5 + 1) * 0.5 * 0.75, 9);
  });

  test.each([1, 2, 3, 4])('at %i samples a cell, each sub-sample is the cell’s light × its aperture shares across and down [def]', (m) => {
    const cell = { ...PANEL_TYPES[0].defaults.cell, cols: 3, rows: 2, fillX: 0.55, fillY: 0.8 };
    const emission = new Float32Array([1, 0.25, 0.5, 0.125, 0.75, 1]);
    const flux = fluxField(emission, cell, m);
    const expected = Float32Array.from({ length: 3 * m * 2 * m }, (_, i) => {
      const [x, y] = [i % (3 * m), Math.floor(i / (3 * m))];
      const e = emission[Math.floor(y / m) * 3 + Math.floor(x / m)] * apertureShare(0.8, y % m, m);
      return e * apertureShare(0.55, x % m, m);
    });
    expect(Array.from(flux.data)).toEqual(Array.from(expected));
  });
});

describe('the halo is a ring (light reflected back by the glass–air surface)', () => {
  // One lit cell in the middle of a 121 × 121 panel, fill 1, halo only: radius r = 3 mm at a
  // 0.3 mm pitch = 10 cells. Total internal reflection returns the light as an annulus from the
  // critical angle on, darker inside it (classical faceplate optics [mem]); the model spreads it
  // evenly over a ring of radius r, softened by σ = RING_SOFTNESS · r [calc].
  const n = 121;
  const c = 60;
  const cell = { ...PANEL_TYPES[0].defaults.cell, cols: n, rows: n, pitchXMm: 0.3, pitchYMm: 0.3, fillX: 1, fillY: 1 };
  const glass = { ...PANEL_TYPES[0].defaults.glass, glowShare: 0, haloShare: 0.2, haloRadiusMm: 3, haloFromGlass: false };
  const emission = new Float32Array(n * n);
  emission[c * n + c] = 1;
  const field = glowField(emission, cell, glowPlan(cell, glass));
  const m = field.width / n;

  test('its radial profile peaks at the ring radius ± one sample, in every direction [calc]', () => {
    const r = (3 / 0.3) * m;
    const centre = c * m + (m - 1) / 2;
    for (const [dx, dy] of [
      [1, 0],
      [0, 1],
      [-1, 0],
      [Math.SQRT1_2, Math.SQRT1_2],
    ]) {
      let best = 0;
      let at = 0;
      for (let d = 0; d < 2 * r; d++) {
        const x = Math.round(centre + d * dx);
        const y = Math.round(centre + d * dy);
        const v = field.data[y * field.width + x];
        if (v > best) [best, at] = [v, d];
      }
      expect({ dx, dy, near: Math.abs(at - r) <= 1 }).toEqual({ dx, dy, near: true });
    }
  });

  test('inside the ring the glass is darker: the centre holds under a tenth of the ring’s light [calc]', () => {
    const centre = Math.round(c * m + (m - 1) / 2);
    const ringAt = field.data[centre * field.width + centre + Math.round(10 * m)];
    expect(field.data[centre * field.width + centre]).toBeLessThan(ringAt / 10);
  });

  test('it keeps the halo share of the cell’s light [calc]', () => {
    const total = field.data.reduce((a, b) => a + b, 0) / (m * m);
    expect(total).toBeCloseTo(0.2, 4);
  });

  test('each sample is the mean of the ring offsets inside the field, summed in offset order in double precision [def]', () => {
    // Every path of ringRows (columns where all offsets are inside, four at a time, and the
    // edges, where some fall off) against the definition, sample by sample, bit for bit.
    const [w, h] = [37, 23];
    const data = Float32Array.from({ length: w * h }, (_, i) => ((i * 2654435761) % 1000) / 997);
    const ring = ringOffsets(6.4, 4.2, 1.1);
    const out = new Float32Array(w * (h - 3));
    ringRows({ width: w, height: h, data }, ring, 2, h - 1, out);
    const expected = new Float32Array(out.length);
    for (let y = 2; y < h - 1; y++)
      for (let x = 0; x < w; x++) {
        let sum = 0;
        for (let k = 0; k < ring.length / 2; k++) {
          const [sx, sy] = [x + ring[2 * k], y + ring[2 * k + 1]];
          if (sx >= 0 && sx < w && sy >= 0 && sy < h) sum += data[sy * w + sx];
        }
        expected[(y - 2) * w + x] = sum * (2 / ring.length);
      }
    expect(Array.from(out)).toEqual(Array.from(expected));
  });
});
