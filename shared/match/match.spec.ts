import { panelTypeById } from '../model/panel-types';
import { mergeParams, type PanelParams } from '../model/parameters';
import { driveLevels } from '../pipeline/render';
import { inWorker, WorkerError } from '../testing/in-worker';
import type { fitSynthetic } from '../testing/match-fixtures';
import type { SyntheticShot } from '../testing/synthetic-photo';
import type { MatchOptions, MatchResult } from './fit';
import { applyHomography, checkMarks, MarkError, solveHomography, type Point } from './homography';
import { matchLayout, patternFor, patternImage, type MatchLayout } from './pattern';
import { bilinear, rectify, rectifyPlanes } from './photo';

const EL = panelTypeById('el-amber-640x480')!.defaults;
/** The look the fit starts from: the amber EL type on a 320 × 240 grid. */
const base: PanelParams = mergeParams(EL, { cell: { cols: 320, rows: 240 } });
/** The "real" panel the synthetic photo shows: every shape figure and the colour differ from the start. */
const truth: PanelParams = mergeParams(base, {
  cell: { fillX: 0.66, fillY: 0.7 },
  glass: { glowRadiusMm: 0.32, glowShare: 0.16, haloRadiusMm: 1.6, haloShare: 0.05 },
  emission: { colourSource: 'chromaticity', chromaX: 0.5, chromaY: 0.42 },
});
const active = { activeWidthMm: 320 * 0.3, activeHeightMm: 240 * 0.3 };
/** A perspective view of the panel filling most of an 1800 × 1425 photo (about 4.8 px a cell). */
const shot = (over: Partial<SyntheticShot> = {}): SyntheticShot => ({
  scale: 6,
  width: 1800,
  height: 1425,
  corners: [
    [135, 120],
    [1680, 165],
    [1650, 1320],
    [165, 1290],
  ],
  exposure: 0.8,
  ambient: 0.01,
  blur: 0.8,
  noise: 0.01,
  quality: 90,
  seed: 7,
  layout: patternFor(base),
  ...over,
});
/** Marks placed by hand: a few pixels off each square's centre. */
const BY_HAND: Point[] = [0, 1, 2, 3].map((i) => [i % 2 ? 3 : -2, i > 1 ? 2 : -3]);
/** A synthetic photo and its fit, in a worker thread (fixtures: shared/testing/match-fixtures.ts). */
const fitPhoto = (...args: Parameters<typeof fitSynthetic>) =>
  inWorker<Awaited<ReturnType<typeof fitSynthetic>>>(require.resolve('../testing/match-fixtures'), 'fitSynthetic', ...args);

describe('homography by direct linear transform', () => {
  it('maps the unit square onto a quad as the closed-form square-to-quad projection does, to float32 precision (gl-matrix) [paper: Heckbert 1989, "Fundamentals of Texture Mapping", §2.2.3]', () => {
    const quad: Point[] = [
      [10, 20],
      [300, 40],
      [280, 260],
      [30, 230],
    ];
    // Heckbert's closed form for the projective map of (0,0), (1,0), (1,1), (0,1) onto the quad.
    const [[x0, y0], [x1, y1], [x2, y2], [x3, y3]] = quad;
    const sx = x0 - x1 + x2 - x3;
    const sy = y0 - y1 + y2 - y3;
    const dx1 = x1 - x2;
    const dx2 = x3 - x2;
    const dy1 = y1 - y2;
    const dy2 = y3 - y2;
    const den = dx1 * dy2 - dx2 * dy1;
    const g = (sx * dy2 - dx2 * sy) / den;
    const hh = (dx1 * sy - sx * dy1) / den;
    const map = (u: number, v: number): Point => {
      const w = g * u + hh * v + 1;
      return [((x1 - x0 + g * x1) * u + (x3 - x0 + hh * x3) * v + x0) / w, ((y1 - y0 + g * y1) * u + (y3 - y0 + hh * y3) * v + y0) / w];
    };
    const h = solveHomography(
      [
        [0, 0],
        [1, 0],
        [1, 1],
        [0, 1],
      ],
      quad,
    );
    for (const [u, v] of [
      [0.5, 0.5],
      [0.2, 0.7],
      [0.9, 0.1],
    ]) {
      const [ax, ay] = applyHomography(h.forward, u, v);
      const [ex, ey] = map(u, v);
      expect(Math.hypot(ax - ex, ay - ey)).toBeLessThan(1e-4);
      const [bu, bv] = applyHomography(h.inverse, ax, ay);
      expect(Math.hypot(bu - u, bv - v)).toBeLessThan(1e-6);
    }
  });

  const square: Point[] = [
    [100, 100],
    [900, 120],
    [880, 700],
    [120, 680],
  ];
  it('accepts four marks placed clockwise from the top-left', () => {
    expect(() => checkMarks(square, 1000, 800)).not.toThrow();
  });
  it.each([
    ['two marks swapped', [square[0], square[2], square[1], square[3]], /out of order/],
    ['anticlockwise', [square[0], square[3], square[2], square[1]], /anticlockwise/],
    ['three on one line', [square[0], [500, 110], square[1], square[3]], /on one line/],
    ['on top of each other', [square[0], [102, 101], square[2], square[3]], /on top of each other/],
    ['outside the photo', [square[0], square[1], [1200, 700], square[3]], /bottom-right mark is outside the photo/],
  ])('refuses marks %s with the reason and what to do', (_name, marks, message) => {
    expect(() => checkMarks(marks as Point[], 1000, 800)).toThrow(MarkError);
    expect(() => checkMarks(marks as Point[], 1000, 800)).toThrow(message);
  });
});

describe('resampling a photo onto the grid', () => {
  /** rectify's definition: each sample the mean of its taps, each tap bilinear() at the homography's point. */
  function definition(
    plane: Float32Array,
    pw: number,
    ph: number,
    m: number[],
    rect: { x: number; y: number; w: number; h: number },
    s: number,
    k: number,
  ) {
    const width = Math.round(rect.w * s);
    const height = Math.round(rect.h * s);
    const data = new Float32Array(width * height);
    for (let j = 0; j < height; j++)
      for (let i = 0; i < width; i++) {
        let sum = 0;
        for (let b = 0; b < k; b++)
          for (let a = 0; a < k; a++) {
            const cy = rect.y + (j + (b + 0.5) / k) / s;
            const cx = rect.x + (i + (a + 0.5) / k) / s;
            const w = m[2] * cx + m[5] * cy + m[8];
            sum += bilinear(plane, pw, ph, (m[0] * cx + m[3] * cy + m[6]) / w, (m[1] * cx + m[4] * cy + m[7]) / w);
          }
        data[j * width + i] = sum / (k * k);
      }
    return data;
  }

  test('three planes at once and in bands of rows give each plane’s samples bit for bit, the photo’s edges (zeros outside) included', () => {
    const [pw, ph] = [97, 71];
    const planes = [0, 1, 2].map((c) => Float32Array.from({ length: pw * ph }, (_, i) => ((i * (7 + c * 13)) % 101) / 100));
    // A perspective view whose grid runs past the photo's left and bottom edges.
    const h = solveHomography(
      [
        [0, 0],
        [40, 0],
        [40, 30],
        [0, 30],
      ],
      [
        [-6, 4],
        [90, 9],
        [85, 77],
        [2, 66],
      ],
    );
    const rect = { x: 0, y: 0, w: 40, h: 30 };
    for (const [s, k] of [
      [2, 2],
      [3, 1],
    ]) {
      const want = planes.map((p) => definition(p, pw, ph, Array.from(h.forward), rect, s, k));
      const height = Math.round(rect.h * s);
      const cut = Math.floor(height / 3);
      const bands = [
        [0, cut],
        [cut, height],
      ].map(([r0, r1]) =>
        rectifyPlanes(planes, { width: pw, height: ph }, h.forward, rect, s, s, { taps: k, rows: [r0, r1] as [number, number] }),
      );
      planes.forEach((p, c) => {
        const joined = Float32Array.from([...bands[0][c], ...bands[1][c]]);
        expect(joined).toEqual(want[c]);
        expect(rectify(p, { width: pw, height: ph }, h.forward, rect, s, s, { taps: k }).data).toEqual(want[c]);
      });
      expect(want[0].some((v) => v === 0) && want[0].some((v) => v > 0)).toBe(true);
    }
  });
});

describe('match pattern', () => {
  const layout = patternFor(base);
  it('has four lit corner squares whose centres are the stated fiducials [calc]', () => {
    const f = layout.fiducialSize;
    for (const [cx, cy] of layout.fiducials) {
      for (let y = cy - f / 2; y < cy + f / 2; y++)
        for (let x = cx - f / 2; x < cx + f / 2; x++) expect(layout.levels[y * layout.cols + x]).toBe(1);
      // The cells just inside the square's inner edges are dark.
      const ix = cx < layout.cols / 2 ? cx + f / 2 : cx - f / 2 - 1;
      expect(layout.levels[(cy | 0) * layout.cols + ix]).toBe(0);
    }
  });
  it('spaces isolated cells by three times the halo radius, so rings do not overlap [calc]', () => {
    // Halo 2.1 mm on a 0.3 mm pitch: 7 cells, so 3.2 × 7 + 1 → the 24-cell cap.
    expect(layout.spacing).toBe(24);
  });
  it('drives exactly its levels through a 1:1 fit with no dither [calc]', () => {
    const four = matchLayout(128, 96, 4);
    const p = mergeParams(EL, { cell: { cols: 128, rows: 96 }, source: { fit: 'native' }, drive: { grayLevels: 4, dither: 'none' } });
    const driven = driveLevels(patternImage(four), p);
    expect(Array.from(driven)).toEqual(Array.from(four.levels));
    expect(four.ramp.map((r) => four.levels[r.y * 128 + r.x])).toEqual([0, 1 / 3, 2 / 3, 1].map((v) => Math.fround(v)));
  });
  it('says which panels are too small for it', () => {
    expect(() => matchLayout(48, 48, 2)).toThrow(/at least 64 × 32 cells; this one has 48 × 48/);
  });
});

describe('fit of a synthetic photo (pipeline render → perspective, lens blur, sensor noise, JPEG 90)', () => {
  let result: MatchResult;
  let photoMarks: Point[];
  beforeAll(async () => {
    ({ result, fiducials: photoMarks } = await fitPhoto(truth, shot(), base, BY_HAND, { camera: { kind: 'srgb' }, ...active }));
  }, 120_000);
  const fitted = (key: string) => result.fitted.find((f) => f.key === key)!;

  it('recovers glow radius and glow share within 10 % [calc: synthetic photo of known parameters]', () => {
    expect(Math.abs(fitted('glowRadiusMm').value / 0.32 - 1)).toBeLessThan(0.1);
    expect(Math.abs(fitted('glowShare').value / 0.16 - 1)).toBeLessThan(0.1);
  });
  it('recovers the pitch within 2 % and the fill within 5 % [calc: synthetic photo of known parameters]', () => {
    expect(Math.abs(fitted('pitchXMm').value / 0.3 - 1)).toBeLessThan(0.02);
    expect(Math.abs(fitted('pitchYMm').value / 0.3 - 1)).toBeLessThan(0.02);
    expect(Math.abs(fitted('fillX').value / 0.66 - 1)).toBeLessThan(0.05);
    expect(Math.abs(fitted('fillY').value / 0.7 - 1)).toBeLessThan(0.05);
  });
  it('recovers the chromaticity within 0.01 in x and y [calc: sRGB ↔ XYZ, IEC 61966-2-1]', () => {
    expect(Math.abs(result.parameters.emission.chromaX - 0.5)).toBeLessThan(0.01);
    expect(Math.abs(result.parameters.emission.chromaY - 0.42)).toBeLessThan(0.01);
    expect(result.parameters.emission.colourSource).toBe('chromaticity');
  });
  it('moves the hand-placed marks onto the squares’ centres (within half a photo pixel) [calc]', () => {
    result.marks.forEach(([x, y], i) => expect(Math.hypot(x - photoMarks[i][0], y - photoMarks[i][1])).toBeLessThan(0.6));
  });
  it('states an uncertainty for every fitted figure, the level curve, and what the photo could not determine', () => {
    for (const f of result.fitted) expect(f.uncertainty).toBeGreaterThanOrEqual(0);
    expect(result.fitted.find((f) => f.key === 'glowShare')!.uncertainty).toBeGreaterThan(0);
    expect(result.levels.map((l) => l.expected)).toEqual([0, 1]);
    expect(result.levels[1].measured).toBeCloseTo(1, 1);
    expect(result.notDetermined.join(' ')).toMatch(/exposure/);
    expect(result.notDetermined.join(' ')).toMatch(/Camera blur/);
    expect(result.quality.agreement).toBeGreaterThan(0.8);
  });
});

describe('photos the fit refuses, with the reason', () => {
  // A small panel for speed: 128 × 96 cells, about 5 px a cell.
  const small = mergeParams(EL, { cell: { cols: 128, rows: 96 } });
  const smallShot = (over: Partial<SyntheticShot> = {}) =>
    shot({
      scale: 5,
      width: 720,
      height: 560,
      corners: [
        [40, 40],
        [680, 50],
        [670, 520],
        [50, 510],
      ],
      layout: patternFor(small),
      ...over,
    });
  const options: MatchOptions = { camera: { kind: 'srgb' }, activeWidthMm: 38.4, activeHeightMm: 28.8 };
  /** The refusal's message (a fit that succeeds fails the test). */
  const refusal = async (over: Partial<SyntheticShot>, offsets = BY_HAND): Promise<string> => {
    const err = await fitPhoto(
      mergeParams(small, { emission: { colourSource: 'chromaticity', chromaX: 0.5, chromaY: 0.42 } }),
      smallShot(over),
      small,
      offsets,
      options,
    ).then(
      () => new WorkerError('none', 'the fit did not refuse the photo'),
      (e: WorkerError) => e,
    );
    expect(err.errorName).toBe('MatchRefusal');
    return err.message;
  };

  it('a photo of another pattern', async () => {
    const other: MatchLayout = patternFor(small);
    // The same corner squares, the rest mirrored left to right.
    const mirrored = Float32Array.from(other.levels, (_, i) => other.levels[Math.floor(i / 128) * 128 + (127 - (i % 128))]);
    expect(await refusal({ layout: { ...other, levels: mirrored } })).toMatch(/does not show the match pattern for 128 × 96 cells/);
  });
  it('a mark placed off the panel', async () => {
    // The bottom-left mark on the dark table beside the panel, 60 px from its square.
    expect(
      await refusal(
        {},
        BY_HAND.map((p, i) => (i === 3 ? [p[0] - 45, p[1] + 42] : p)),
      ),
    ).toMatch(/bottom-left mark is not on a lit corner square/);
  });
  it('a photo that is too dark', async () => {
    expect(await refusal({ exposure: 0.02, ambient: 0 })).toMatch(/too dark: the full-on patch reaches only \d+ of 255/);
  });
  it('an overexposed photo, with the clipped share', async () => {
    expect(await refusal({ exposure: 1.6 })).toMatch(/\d+ % of the full-on patch is clipped at white/);
  });
  it('a photo where the cells are too small to see', async () => {
    const message = await refusal({
      width: 360,
      height: 280,
      scale: 2,
      corners: [
        [20, 20],
        [230, 25],
        [225, 180],
        [25, 175],
      ],
    });
    expect(message).toMatch(/covers only 1\.\d photo pixels a cell; at least 2 are needed/);
  });
});
