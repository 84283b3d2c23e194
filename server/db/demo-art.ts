import sharp from 'sharp';
import { EMBER_5X7 } from '../../fonts/ember-5x7';
import { pngOf } from '../render/png-of';

/** A grayscale canvas for the demo drawings (0–255 per pixel). */
class Sketch {
  readonly px: Uint8Array;
  constructor(
    readonly width: number,
    readonly height: number,
  ) {
    this.px = new Uint8Array(width * height);
  }
  set(x: number, y: number, v: number): void {
    if (x >= 0 && y >= 0 && x < this.width && y < this.height) this.px[y * this.width + x] = v;
  }
  rect(x: number, y: number, w: number, h: number, v: number): void {
    for (let j = 0; j < h; j++) for (let i = 0; i < w; i++) this.set(x + i, y + j, v);
  }
  disc(cx: number, cy: number, r: number, v: number): void {
    for (let y = -r; y <= r; y++) for (let x = -r; x <= r; x++) if (x * x + y * y <= r * r) this.set(cx + x, cy + y, v);
  }
  text(s: string, x: number, y: number, scale: number, v: number): void {
    [...s.toUpperCase()].forEach((ch, k) => {
      const glyph = EMBER_5X7[ch] ?? EMBER_5X7['?'];
      glyph.forEach((row, gy) =>
        [...row].forEach((c, gx) => c === '#' && this.rect(x + (k * 6 + gx) * scale, y + gy * scale, scale, scale, v)),
      );
    });
  }
  png(): Buffer {
    return pngOf(this.width, this.height, (x, y) => {
      const v = this.px[y * this.width + x];
      return [v, v, v, 255];
    });
  }
}

/** The title screen: name, a kiln with a glowing mouth, a gradient horizon. */
function titleScreen(): Buffer {
  const s = new Sketch(320, 240);
  for (let y = 150; y < 240; y++) s.rect(0, y, 320, 1, Math.round(((y - 150) / 90) * 90));
  s.text('KILN & QUARTZ', 82, 28, 2, 255);
  s.text('A PUZZLE OF LIGHT', 108, 52, 1, 180);
  s.rect(130, 100, 60, 80, 140);
  s.rect(150, 80, 20, 20, 140);
  s.disc(160, 150, 14, 255);
  s.rect(146, 150, 29, 30, 255);
  for (let i = 0; i < 12; i++) s.disc(60 + i * 19, 210 - (i % 3) * 4, 2, 220);
  s.text('PRESS START', 127, 200, 1, 255);
  return s.png();
}

/** One frame of the walk cycle: a 32 × 32 figure with legs and arms at phase k of 4. */
function walkFrame(k: number): Sketch {
  const s = new Sketch(32, 32);
  s.disc(16, 6, 4, 255);
  s.rect(14, 11, 5, 10, 255);
  const legs = [
    [-4, 4],
    [-1, 1],
    [4, -4],
    [1, -1],
  ][k];
  const arms = [
    [3, -3],
    [1, -1],
    [-3, 3],
    [-1, 1],
  ][k];
  for (let t = 0; t < 10; t++) {
    s.set(15 + Math.round((legs[0] * t) / 10), 21 + t, 255);
    s.set(17 + Math.round((legs[1] * t) / 10), 21 + t, 255);
  }
  for (let t = 0; t < 7; t++) {
    s.set(13 + Math.round((arms[0] * t) / 7), 12 + t, 200);
    s.set(19 + Math.round((arms[1] * t) / 7), 12 + t, 200);
  }
  return s;
}

/** The walk cycle as a 4-frame animated GIF (120 ms a frame). */
async function walkCycle(): Promise<Buffer> {
  const frames = [0, 1, 2, 3].map(walkFrame);
  const raw = Buffer.alloc(32 * 32 * 4 * 4);
  frames.forEach((f, k) => f.px.forEach((v, i) => raw.set([v, v, v, 255], (k * 1024 + i) * 4)));
  return sharp(raw, { raw: { width: 32, height: 128, channels: 4, pageHeight: 32 } })
    .gif({ delay: [120, 120, 120, 120], loop: 0 })
    .toBuffer();
}

/** The HUD font sheet: every glyph of Ember 5×7 on an 8 × 8 grid, 16 to a row. */
function hudFontSheet(): Buffer {
  const glyphs = Object.keys(EMBER_5X7);
  const s = new Sketch(128, Math.ceil(glyphs.length / 16) * 8);
  glyphs.forEach((g, i) => s.text(g, (i % 16) * 8 + 1, Math.floor(i / 16) * 8, 1, 255));
  return s.png();
}

/** A comic-style still: night street, moon, dithered sky, a speech balloon. */
function comicStill(): Buffer {
  const s = new Sketch(320, 240);
  for (let y = 0; y < 160; y++) for (let x = 0; x < 320; x++) s.set(x, y, Math.round((1 - y / 160) * 70 + ((x * 7 + y * 13) % 9)));
  s.disc(250, 45, 22, 240);
  s.disc(240, 40, 20, 60);
  const roofs = [
    [0, 110, 60],
    [60, 90, 50],
    [110, 120, 40],
    [150, 80, 70],
    [220, 105, 50],
    [270, 95, 50],
  ];
  for (const [x, top, w] of roofs) {
    s.rect(x, top, w, 240 - top, 20);
    for (let wy = top + 10; wy < 200; wy += 18) for (let wx = x + 8; wx < x + w - 8; wx += 14) if ((wx + wy) % 3) s.rect(wx, wy, 6, 8, 200);
  }
  s.rect(0, 200, 320, 40, 45);
  s.rect(30, 20, 150, 40, 255);
  s.rect(32, 22, 146, 36, 10);
  for (let i = 0; i < 10; i++) s.rect(60 + i, 60 + i, 10 - i, 1, 255);
  s.text('THE KILN IS LIT.', 40, 28, 1, 255);
  s.text('LETS GO!', 40, 42, 1, 255);
  return s.png();
}

/** The demo artworks of the fictional studio, drawn by code here. */
export async function demoArtworks(): Promise<
  { name: string; file: string; bytes: Buffer; sheet?: { frameWidth: number; frameHeight: number; frameDelayMs: number } }[]
> {
  return [
    { name: 'Title screen', file: 'title-screen.png', bytes: titleScreen() },
    { name: 'Walk cycle', file: 'walk-cycle.gif', bytes: await walkCycle() },
    { name: 'HUD font sheet', file: 'hud-font.png', bytes: hudFontSheet() },
    { name: 'Comic still: night kiln', file: 'comic-still.png', bytes: comicStill() },
  ];
}
