import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { PNG } from 'pngjs';
import sharp from 'sharp';
import { bandChromaticity } from '@shared/testing/band-chromaticity';
import { main } from './main';
import { pngOf } from '../testing/images';
import { syntheticRom } from '@shared/drive/sample-rom';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';

/** Runs the CLI in-process and captures what it prints. */
async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const out: string[] = [];
  const err: string[] = [];
  const log = jest.spyOn(console, 'log').mockImplementation((m: string) => void out.push(m));
  const error = jest.spyOn(console, 'error').mockImplementation((m: string) => void err.push(m));
  try {
    const code = await main(argv);
    return { code, out: out.join('\n'), err: err.join('\n') };
  } finally {
    log.mockRestore();
    error.mockRestore();
  }
}

describe('cli', () => {
  test('emission --peak 585 --json: the 585 nm locus point and #FF9E00 [calc, docs/references.md]', async () => {
    const r = await cli('emission', '--peak', '585', '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out)).toEqual({ x: 0.54479, y: 0.45443, hex: '#FF9E00' });
  });

  test('emission with a width gives the band chromaticity [calc from the CIE table, summed in shared/testing]', async () => {
    const r = await cli('emission', '--peak', '585', '--fwhm', '50', '--json');
    const { x, y } = JSON.parse(r.out);
    const expected = bandChromaticity(585, 50);
    expect(x).toBeCloseTo(expected.x, 4);
    expect(y).toBeCloseTo(expected.y, 4);
  });

  test.each([
    [['emission', '--peak', '900'], '--peak must be a number from 380 to 780, got "900"'],
    [['emission'], '--peak must be a number'],
    [['frobnicate'], 'unknown command "frobnicate"'],
    [['render', 'x.png', '--preset', 'nope', '--out', 'y.png'], 'neither a built-in preset id nor a .json file'],
    [['emission', '--bogus'], 'Unknown option'],
  ])('%j exits 2 with a clear message', async (argv, message) => {
    const r = await cli(...argv);
    expect(r.code).toBe(2);
    expect(r.err).toContain(message);
    expect(r.err).toContain('usage:');
  });

  test('presets --json lists every panel type and preset', async () => {
    const r = await cli('presets', '--json');
    const doc = JSON.parse(r.out);
    expect(doc.panelTypes.length).toBeGreaterThanOrEqual(10);
    expect(doc.presets.length).toBeGreaterThanOrEqual(doc.panelTypes.length);
  });

  test('render writes a PNG of cols × scale by rows × scale from a preset file', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-'));
    const input = path.join(dir, 'in.png');
    writeFileSync(
      input,
      pngOf(20, 10, (x) => [x * 12, 0, 0, 255]),
    );
    const doc = JSON.parse((await cli('presets', '--json')).out);
    const params = { ...doc.presets[0].parameters, cell: { ...doc.presets[0].parameters.cell, cols: 40, rows: 20 } };
    writeFileSync(path.join(dir, 'p.json'), JSON.stringify({ parameters: params }));
    const r = await cli('render', input, '--preset', path.join(dir, 'p.json'), '--scale', '2', '--out', path.join(dir, 'out.png'));
    expect(r.code).toBe(0);
    const png = PNG.sync.read(readFileSync(path.join(dir, 'out.png')));
    expect([png.width, png.height]).toEqual([80, 40]);
  });

  test('render with an invalid preset file names the bad parameter', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-'));
    writeFileSync(path.join(dir, 'bad.json'), JSON.stringify({ source: {} }));
    writeFileSync(
      path.join(dir, 'in.png'),
      pngOf(2, 2, () => [0, 0, 0, 255]),
    );
    const r = await cli('render', path.join(dir, 'in.png'), '--preset', path.join(dir, 'bad.json'), '--out', path.join(dir, 'o.png'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/source\.fit/);
  });
});

describe('cli drive timing', () => {
  test('timing --mode 640x480@60 --standard dmt --dual-scan --pixels-per-clock 4 --json [std DMT row; calc shift clock]', async () => {
    const r = await cli('timing', '--mode', '640x480@60', '--standard', 'dmt', '--dual-scan', '--pixels-per-clock', '4', '--json');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc).toMatchObject({
      pixelClockMHz: 25.175,
      h: { active: 640, frontPorch: 16, sync: 96, backPorch: 48, total: 800 },
      v: { active: 480, frontPorch: 10, sync: 2, backPorch: 33, total: 525 },
      hSyncPositive: false,
      vSyncPositive: false,
    });
    expect(doc.lineRateKHz).toBeCloseTo(31.469, 3);
    expect(doc.refreshHz).toBeCloseTo(59.94, 2);
    expect(doc.shiftClockMHz).toBeCloseTo(25.175 / 8, 3);
  });

  test('timing with CVT reduced blanking v2 [std worked result]', async () => {
    const doc = JSON.parse((await cli('timing', '--mode', '640x480@60', '--standard', 'cvt-rb2', '--json')).out);
    expect(doc.pixelClockMHz).toBe(21.384);
    expect([doc.h.total, doc.v.total]).toEqual([720, 495]);
  });

  test('registers --mode 640x480@60 --standard dmt --json: 25 two-digit hex values and misc E3', async () => {
    const doc = JSON.parse((await cli('registers', '--mode', '640x480@60', '--standard', 'dmt', '--json')).out);
    expect(doc.crtc).toHaveLength(25);
    for (const v of doc.crtc) expect(v).toMatch(/^[0-9A-F]{2}$/);
    expect([doc.crtc[0], doc.crtc[1], doc.crtc[6], doc.crtc[0x10], doc.crtc[0x12]]).toEqual(['5F', '4F', '0B', 'EA', 'DF']);
    expect(doc.misc).toBe('E3');
  });

  test.each([
    [['timing', '--mode', '123x45@60', '--standard', 'dmt', '--json'], 'not among the fixed'],
    [['timing', '--mode', '640x480', '--standard', 'cvt'], 'write the mode as width x height @ refresh'],
    [['timing', '--mode', '640x480@60', '--standard', 'gtf'], '--standard must be one of dmt, cvt, cvt-rb, cvt-rb2'],
    [['timing', '--mode', '640x480@2', '--standard', 'cvt'], 'refresh rate must be from 20 to 480 Hz'],
    [['timing', '--mode', '640x480@60', '--standard', 'dmt', '--pixels-per-clock', '3'], '--pixels-per-clock must be one of 1, 4, 8, 16'],
    [['registers', '--mode', '1004x480@60', '--standard', 'cvt-rb2'], '8-pixel character clock'],
    [['registers'], '--mode is required'],
  ])('%j exits 2 with a clear message', async (argv, message) => {
    const r = await cli(...argv);
    expect(r.code).toBe(2);
    expect(r.err).toContain(message);
  });
});

describe('cli frame-data', () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-fd-'));
  const input = path.join(dir, 'in.png');
  // A 640 × 480 card: left half white, right half black, so a 1-bit frame is 40 bytes of FF then 40 of 00 a row.
  writeFileSync(
    input,
    pngOf(640, 480, (x) => (x < 320 ? [255, 255, 255, 255] : [0, 0, 0, 255])),
  );

  test('--format c: the header’s array has cols·rows·bits/8 numbers that unpack to the image (MSB first, row by row) [calc]', async () => {
    const out = path.join(dir, 'title.h');
    const r = await cli('frame-data', input, '--preset', 'el-amber-640x480.line-art', '--bits', '1', '--format', 'c', '--out', out);
    expect(r.code).toBe(0);
    expect(r.err).toContain('38400 bytes');
    const text = readFileSync(out, 'utf8');
    const m = /static const uint8_t title\[(\d+)\] = \{([^}]*)\}/.exec(text)!;
    expect(Number(m[1])).toBe(38400);
    const bytes = m[2]
      .split(',')
      .map((s) => s.trim())
      .filter(Boolean)
      .map((s) => parseInt(s, 16));
    // Row 100: bytes 100·80 … 100·80 + 79. Row droop and glow do not reach the data.
    expect(bytes.slice(8000, 8080)).toEqual([...new Array(40).fill(0xff), ...new Array(40).fill(0)]);
  });

  test('--format bin with dual-scan planes and --format hex with FRC', async () => {
    expect(
      (
        await cli(
          'frame-data',
          input,
          '--preset',
          'el-amber-640x480.line-art',
          '--bits',
          '1',
          '--dual-scan',
          'planes',
          '--format',
          'bin',
          '--out',
          path.join(dir, 'f.bin'),
        )
      ).code,
    ).toBe(0);
    expect(readFileSync(path.join(dir, 'f.bin')).length).toBe(38400);
    const r = await cli(
      'frame-data',
      input,
      '--preset',
      'el-amber-640x480.standard',
      '--bits',
      '1',
      '--frc',
      '4',
      '--format',
      'hex',
      '--out',
      path.join(dir, 'f.hex'),
    );
    expect(r.code).toBe(0);
    expect(r.err).toContain('3 frames of 38400 bytes');
    expect(readFileSync(path.join(dir, 'f.hex'), 'utf8').trimEnd().endsWith(':00000001FF')).toBe(true);
  });

  test.each([
    [
      ['frame-data', 'in.png', '--preset', 'el-amber-640x480.standard', '--format', 'c', '--out', 'x.h'],
      '--bits must be one of 1, 2, 4, got nothing',
    ],
    [
      ['frame-data', 'in.png', '--preset', 'el-amber-640x480.standard', '--bits', '1', '--format', 'svg', '--out', 'x'],
      '--format must be one of bin, hex, c, got "svg"',
    ],
    [
      ['frame-data', 'in.png', '--preset', 'el-amber-640x480.standard', '--bits', '1', '--dual-scan', 'yes', '--format', 'c', '--out', 'x'],
      '--dual-scan must be one of planes, interleaved',
    ],
    [
      ['frame-data', 'in.png', '--preset', 'crt-green-p1.standard', '--bits', '2', '--format', 'c', '--out', 'x'],
      'the preset has 16 gray levels but 2 bits a cell hold 4',
    ],
  ])('%j exits 2 with a clear message', async (argv, message) => {
    const args = argv.map((a) => (a === 'in.png' ? input : a === 'x' || a === 'x.h' ? path.join(dir, a) : a));
    const r = await cli(...args);
    expect(r.code).toBe(2);
    expect(r.err).toContain(message);
  });
});

describe('cli rom-info and rom-patch', () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-rom-'));
  const rom = path.join(dir, 'card.rom');
  writeFileSync(rom, syntheticRom());

  test('rom-info --json: size, checksum, and the table entries with their decoded timings [ds]', async () => {
    const r = await cli('rom-info', rom, '--json');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc).toMatchObject({ size: 32768, checksumOk: true, table: { offset: 0x1000, from: 'pointer' } });
    expect(doc.entries).toHaveLength(29);
    expect(doc.entries[0x1b]).toMatchObject({
      index: 0x1b,
      offset: 0x16c0,
      status: 'ok',
      standardMode: 'mode 12h',
      width: 640,
      height: 480,
      pixelClockMHz: 25.175,
      refreshHz: 59.94,
    });
    expect(doc.entries[0]).toMatchObject({ index: 0, status: 'empty', width: null });
  });

  test('rom-patch, then rom-info on the result: the new timing, the sum still 0 mod 256 [calc]', async () => {
    const out = path.join(dir, 'patched.rom');
    const r = await cli('rom-patch', rom, '--entry', '0x1b', '--mode', '640x400@70', '--standard', 'dmt', '--out', out, '--json');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out);
    expect(doc).toMatchObject({ entry: 0x1b, offset: 0x16c0, mode: '640x400@70', checksum: { at: 32767 } });
    expect(doc.changes.find((c: { field: string }) => c.field === 'CR06 Vertical total')).toMatchObject({ old: 0x0b, new: 0xbf });
    const bytes = readFileSync(out);
    expect(bytes.reduce((s, v) => (s + v) & 0xff, 0)).toBe(0);
    const info = JSON.parse((await cli('rom-info', out, '--json')).out);
    expect(info.entries[0x1b]).toMatchObject({ width: 640, height: 400, refreshHz: 70.086 }); // 25.175 MHz / (800 · 449) [calc]
    const text = await cli(
      'rom-patch',
      rom,
      '--entry',
      '27',
      '--mode',
      '640x400@70',
      '--standard',
      'dmt',
      '--out',
      path.join(dir, 'p2.rom'),
    );
    expect(text.out).toContain('0x16D0  0B → BF  CR06 Vertical total');
    expect(text.out).toContain('verify the burned chip');
  });

  test.each([
    [
      ['rom-patch', 'card.rom', '--entry', '27', '--mode', '640x400@70', '--standard', 'dmt', '--out', 'card.rom'],
      2,
      '--out must be a new file',
    ],
    [
      ['rom-patch', 'card.rom', '--entry', 'twelve', '--mode', '640x400@70', '--standard', 'dmt', '--out', 'x.rom'],
      2,
      '--entry must be a whole number',
    ],
    [['rom-patch', 'card.rom', '--entry', '2', '--mode', '640x400@70', '--standard', 'dmt', '--out', 'x.rom'], 1, 'entry 2 is empty'],
    [['rom-info', 'card.rom', '--table-offset', '0x7FF0'], 1, 'does not fit in the 32768-byte image'],
  ])('%j exits %i with a clear message', async (argv, code, message) => {
    const r = await cli(...argv.map((a) => (a.endsWith('.rom') ? path.join(dir, a) : a)));
    expect(r.code).toBe(code);
    expect(r.err).toContain(message);
  });
});

describe('cli acuity and flash', () => {
  test('acuity --json: 0.3 mm at 600 mm is 1.7189′ a cell, resolvable, blending beyond 1031.3 mm [calc from ISO 8596 1′]', async () => {
    const r = await cli('acuity', '--pitch-mm', '0.3', '--distance-mm', '600', '--json');
    expect(r.code).toBe(0);
    expect(JSON.parse(r.out)).toEqual({ arcminPerCell: 1.7189, cellsPerDegree: 34.9066, resolvable: true, limitDistanceMm: 1031.324 });
    expect((await cli('acuity', '--pitch-mm', '0', '--distance-mm', '600')).err).toContain('--pitch-mm must be a number from 0.001');
  });

  test('flash --json on a GIF: a full-panel white flash four times a second fails, twice a second passes [std WCAG 2.2 SC 2.3.1]', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-flash-'));
    const gif = async (delayMs: number) => {
      const w = 64;
      const h = 48;
      const raw = Buffer.alloc(w * h * 4 * 4);
      for (let k = 0; k < 4; k++) raw.fill(k % 2 === 0 ? 255 : 0, k * w * h * 4, (k + 1) * w * h * 4);
      const file = path.join(dir, `flash-${delayMs}.gif`);
      writeFileSync(
        file,
        await sharp(raw, { raw: { width: w, height: h * 4, channels: 4, pageHeight: h } })
          .gif({ delay: [delayMs, delayMs, delayMs, delayMs], loop: 0 })
          .toBuffer(),
      );
      return file;
    };
    // Amber EL: no persistence to speak of, so the panel follows the art. GIF delays are whole
    // hundredths: 120 ms frames are 4.2 flashes a second (9 transitions in a second: 4 flashes).
    const fast = JSON.parse((await cli('flash', await gif(120), '--panel', 'el-amber-640x480', '--distance-mm', '600', '--json')).out);
    expect(fast).toMatchObject({ maxFlashesPerSecond: 4, generalFlashFail: true, pass: false, frames: 4 });
    const slow = JSON.parse((await cli('flash', await gif(250), '--panel', 'el-amber-640x480', '--json')).out);
    expect(slow).toMatchObject({ maxFlashesPerSecond: 2, generalFlashFail: false, redFlashFail: false, pass: true });
    const text = await cli('flash', await gif(250), '--panel', 'el-amber-640x480');
    expect(text.out).toContain('it does not certify');
    expect((await cli('flash', await gif(250), '--panel', 'lcd-9000')).err).toContain('is not a built-in panel type');
  });
});

describe('cli legibility', () => {
  test('--json: one-cell line pairs keep less contrast through a wider glow [calc]', async () => {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'emberline-cli-leg-'));
    const file = path.join(dir, 'pairs.png');
    writeFileSync(
      file,
      pngOf(640, 480, (x) => (x % 2 === 0 ? [255, 255, 255, 255] : [0, 0, 0, 255])),
    );
    const preset = (glowRadiusMm: number) => {
      const p = path.join(dir, `glow-${glowRadiusMm}.json`);
      writeFileSync(
        p,
        JSON.stringify(
          mergeParams(builtInPresetById('el-amber-640x480.line-art')!.parameters, {
            source: { fit: 'native' },
            glass: { glowRadiusMm, glowShare: 0.9, haloShare: 0 },
          }),
        ),
      );
      return p;
    };
    const sharp0 = JSON.parse((await cli('legibility', file, '--preset', preset(0), '--json')).out);
    const wide = JSON.parse((await cli('legibility', file, '--preset', preset(0.2), '--json')).out);
    expect(sharp0.edges).toBe(639 * 480);
    expect(sharp0.score).toBeGreaterThan(0.9);
    expect(wide.score).toBeLessThan(sharp0.score);
  });
});
