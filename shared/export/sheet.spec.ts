import pixelmatch from 'pixelmatch';
import type { RgbaImage } from '../pipeline/types';
import { fitText, printable, textWidth } from './pixel-text';
import {
  composeSheet,
  differenceMap,
  fitNearest,
  LABEL_LINES,
  MIN_COLUMN_WIDTH,
  scaleBarMm,
  SHEET_COLOURS,
  SHEET_GAP,
  SHEET_MARGIN,
  sheetGeometry,
  type Rect,
} from './sheet';

const solid = (width: number, height: number, rgb: [number, number, number]): RgbaImage => {
  const data = new Uint8Array(width * height * 4);
  for (let i = 0; i < data.length; i += 4) data.set([...rgb, 255], i);
  return { width, height, data };
};
const pixel = (img: RgbaImage, x: number, y: number) => Array.from(img.data.subarray((y * img.width + x) * 4, (y * img.width + x) * 4 + 4));
/** Pixels of a rectangle that are not the sheet's background. */
const inked = (img: RgbaImage, r: Rect) => {
  let n = 0;
  for (let y = r.y; y < r.y + r.height; y++)
    for (let x = r.x; x < r.x + r.width; x++) if (pixel(img, x, y).slice(0, 3).join() !== SHEET_COLOURS.background.join()) n++;
  return n;
};

describe('sheet geometry [calc: the layout rules written in sheet.ts, worked by hand here]', () => {
  it('puts a 2 × 2 grid of 400 × 200 cells where the rules say', () => {
    const g = sheetGeometry([
      [
        { width: 400, height: 200 },
        { width: 400, height: 200 },
      ],
      [
        { width: 400, height: 200 },
        { width: 400, height: 200 },
      ],
    ]);
    // width = 2 margins + 2 columns + 1 gap
    expect(g.width).toBe(2 * SHEET_MARGIN + 2 * 400 + SHEET_GAP);
    expect(g.cells[0][0].image).toEqual({ x: SHEET_MARGIN, y: g.title.y + g.title.height + SHEET_GAP, width: 400, height: 200 });
    expect(g.cells[0][1].image.x).toBe(SHEET_MARGIN + 400 + SHEET_GAP);
    // Row 2 starts below row 1's image, label block and scale-bar line, and a gap.
    expect(g.cells[1][0].image.y).toBe(g.cells[0][0].bar.y + g.cells[0][0].bar.height + SHEET_GAP);
    expect(g.cells[0][0].label.y).toBeGreaterThan(g.cells[0][0].image.y + 200);
    expect(g.footer.y).toBeGreaterThan(g.cells[1][1].bar.y + g.cells[1][1].bar.height);
    expect(g.height).toBe(g.footer.y + g.footer.height + SHEET_MARGIN);
  });

  it('sizes each column to its widest image (at least the minimum) and centres narrower ones', () => {
    const g = sheetGeometry([
      [
        { width: 640, height: 100 },
        { width: 100, height: 50 },
      ],
      [
        { width: 320, height: 300 },
        { width: 80, height: 40 },
      ],
    ]);
    expect(g.cells[0][0].slot.width).toBe(640);
    expect(g.cells[0][1].slot.width).toBe(MIN_COLUMN_WIDTH);
    expect(g.cells[1][0].image.x).toBe(SHEET_MARGIN + (640 - 320) / 2);
    // Vertically too: the 50 px image in a 100 px row.
    expect(g.cells[0][1].image.y).toBe(g.cells[0][1].slot.y + 25);
    expect(g.cells[0][0].slot.height).toBe(100);
    expect(g.cells[1][0].slot.height).toBe(300);
  });

  it('refuses an empty sheet or ragged rows', () => {
    expect(() => sheetGeometry([])).toThrow(RangeError);
    expect(() => sheetGeometry([[{ width: 1, height: 1 }], []])).toThrow(RangeError);
  });
});

describe('composed sheet [calc]', () => {
  const cells = [
    [
      { image: solid(300, 200, [255, 0, 0]), lines: ['Standard · r3', 'Title screen', '2 levels'], pxPerMm: 10 },
      { image: solid(300, 200, [0, 255, 0]), lines: ['Soft', 'Title screen', '16 levels'], pxPerMm: 10 },
    ],
    [
      { image: solid(300, 200, [0, 0, 255]), lines: ['Standard · r3', 'Walk cycle', ''], pxPerMm: 10 },
      { image: solid(300, 200, [255, 255, 255]), lines: ['Soft', 'Walk cycle', ''], pxPerMm: 10 },
    ],
  ];
  const { image, geometry } = composeSheet({
    title: 'Kiln & Quartz: looks',
    subtitle: 'Grid',
    footer: ['Kiln & Quartz · 2026-12-03', 'Pipeline 4'],
    rows: cells,
  });

  it('copies every cell image exactly into its rectangle', () => {
    cells.forEach((row, r) =>
      row.forEach((cell, c) => {
        const at = geometry.cells[r][c].image;
        for (const [dx, dy] of [
          [0, 0],
          [299, 0],
          [0, 199],
          [299, 199],
          [150, 100],
        ])
          expect(pixel(image, at.x + dx, at.y + dy)).toEqual(pixel(cell.image, dx, dy));
        // Just outside the image: the sheet, not the cell.
        expect(pixel(image, at.x - 1, at.y)).not.toEqual(pixel(cell.image, 0, 0));
      }),
    );
  });

  it('draws the title, every label, every scale bar and the footer inside their regions', () => {
    expect(inked(image, geometry.title)).toBeGreaterThan(100);
    for (const row of geometry.cells) {
      for (const g of row) {
        expect(inked(image, g.label)).toBeGreaterThan(50);
        expect(inked(image, g.bar)).toBeGreaterThan(50);
      }
    }
    expect(inked(image, geometry.footer)).toBeGreaterThan(100);
    // The margins stay empty.
    expect(inked(image, { x: 0, y: 0, width: image.width, height: SHEET_MARGIN })).toBe(0);
    expect(inked(image, { x: 0, y: image.height - SHEET_MARGIN, width: image.width, height: SHEET_MARGIN })).toBe(0);
  });

  it('draws the scale bar as long as the millimetres it names (10 px/mm, a third of a 384 px column → a 10 mm bar of 100 px)', () => {
    const bar = geometry.cells[0][0].bar;
    const y = bar.y + 6;
    let run = 0;
    while (
      pixel(image, bar.x + run, y)
        .slice(0, 3)
        .join() === SHEET_COLOURS.bar.join()
    )
      run++;
    expect(run).toBe(100);
  });

  it('has one label block of LABEL_LINES lines a cell', () => {
    expect(geometry.cells[0][0].label.height / LABEL_LINES).toBe(20);
  });
});

describe('scale bar length [calc: 1-2-5 series, the usual choice of round steps]', () => {
  it.each([
    [10, 132, 10],
    [10, 99, 5],
    [3.2, 200, 50],
    [0.5, 200, 200],
    [100, 150, 1],
    [1000, 150, 0.1],
  ])('%f px/mm within %f px → %f mm', (pxPerMm, maxPx, mm) => {
    expect(scaleBarMm(pxPerMm, maxPx)).toBeCloseTo(mm, 9);
  });
});

describe('pixel text [calc: Ember 5×7 advances 6 font pixels a glyph]', () => {
  it('measures, prints in capitals with ? for missing glyphs, and cuts with ..', () => {
    expect(textWidth('ABC', 2)).toBe((3 * 6 - 1) * 2);
    expect(printable('r3 · éa')).toBe('R3 · ?A');
    expect(fitText('ABCDEFGHIJ', 2, textWidth('ABCDE..', 2))).toBe('ABCDE..');
    expect(fitText('ABC', 2, 1000)).toBe('ABC');
  });
});

describe('original beside a render', () => {
  it('enlarges by the largest whole number that fits, with hard edges [calc]', () => {
    const src: RgbaImage = { width: 2, height: 1, data: Uint8Array.from([255, 0, 0, 255, 0, 0, 255, 255]) };
    const out = fitNearest(src, 9, 4);
    expect([out.width, out.height]).toEqual([8, 4]);
    expect(pixel(out, 3, 3)).toEqual([255, 0, 0, 255]);
    expect(pixel(out, 4, 0)).toEqual([0, 0, 255, 255]);
  });
  it('shows a transparent pixel as black', () => {
    expect(pixel(fitNearest({ width: 1, height: 1, data: Uint8Array.from([200, 200, 200, 0]) }, 1, 1), 0, 0)).toEqual([0, 0, 0, 255]);
  });
});

describe('difference map', () => {
  // Two 64 × 48 images differing in a scatter of pixels by 1 to 200 codes.
  const a = solid(64, 48, [40, 30, 20]);
  const b = solid(64, 48, [40, 30, 20]);
  for (let k = 0; k < 97; k++) {
    const i = ((k * 131) % (64 * 48)) * 4;
    b.data[i + (k % 3)] += 1 + ((k * 37) % 200);
  }

  it('counts the same differing pixels as pixelmatch at threshold 0 [ref: pixelmatch 7, an independent image-comparison library]', () => {
    const { diff } = differenceMap(a, b);
    const count = pixelmatch(a.data, b.data, undefined, 64, 48, { threshold: 0, includeAA: true });
    expect(diff.differing).toBe(count);
    expect(diff.differing).toBe(97);
    expect(diff.maxChannel).toBe(Math.max(...Array.from({ length: 97 }, (_, k) => 1 + ((k * 37) % 200))));
  });

  it('marks differing pixels in colour and equal ones in gray', () => {
    const d = differenceMap(a, b);
    expect(pixel(d.image, 0, 0)[0]).toBe(255);
    const [r, g, bl] = pixel(d.image, 1, 0);
    expect(r).toBe(g);
    expect(g).toBe(bl);
  });

  it('refuses renders of different sizes', () => {
    expect(() => differenceMap(a, solid(10, 10, [0, 0, 0]))).toThrow('differ in size');
  });
});
