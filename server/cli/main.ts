import { readFile, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { emissionColour, spectrumToXyz } from '@shared/color/emission';
import { BUILT_IN_PRESETS, builtInPresetById, PANEL_TYPES } from '@shared/model/panel-types';
import { panelParamsSchema, type PanelParams } from '@shared/model/parameters';
import { interfaceFigures, PIXELS_PER_CLOCK, type PanelInterface } from '@shared/drive/interface';
import { BITS_PER_CELL, frameData, MAX_FRC_LEVELS, type FrameLayout } from '@shared/drive/frame-data';
import { encodeFrameData, FRAME_DATA_FORMAT_INFO, FRAME_DATA_FORMATS } from '@shared/drive/frame-data-formats';
import { hex2, vgaRegisters } from '@shared/drive/registers';
import { resolveTiming, STANDARDS, type Standard } from '@shared/drive/resolve';
import { figures } from '@shared/drive/timing';
import { acuity } from '@shared/analysis/acuity';
import { flashCheck } from '@shared/analysis/flash-check';
import { legibility, LOST_CONTRAST } from '@shared/analysis/panel-report';
import { panelEmissions } from '@shared/pipeline/render';
import { describeEntry, patchRom, readRom, RomError, type RomInfo } from '@shared/drive/vga-rom';
import { AppError } from '../core/app-error';
import { issuesOf } from '../core/validate';
import { decodeImage } from '../render/decode';
import { RenderEngine } from '../render/render-engine';

/** A usage error: printed with the usage line, exit code 2. */
class UsageError extends Error {}

const USAGE = `usage: npm run -s cli -- <command> [options]

commands:
  render <in.png|gif|jpg|webp> --preset <built-in id | file.json> [--scale N] [--frame K] --out <out.png>
  emission --peak <nm> [--fwhm <nm>] [--json]
  presets [--json]
  timing --mode 640x480@60 --standard dmt|cvt|cvt-rb|cvt-rb2 [--dual-scan] [--pixels-per-clock 1|4|8|16] [--json]
  registers --mode 640x480@60 --standard dmt|cvt|cvt-rb|cvt-rb2 [--json]
  frame-data <image> --preset <built-in id | file.json> --bits 1|2|4 [--bit-order msb|lsb]
             [--pixels-per-clock 1|4|8|16] [--dual-scan planes|interleaved] [--frc N] [--frame K]
             [--name NAME] --format bin|hex|c --out <file>
  rom-info <rom.bin> [--table-offset N] [--json]
  rom-patch <rom.bin> --entry N --mode 640x480@60 --standard dmt|cvt|cvt-rb|cvt-rb2
            [--table-offset N] [--checksum-at N] --out <patched.bin> [--json]
  (N: decimal or 0x… hex)
  acuity --pitch-mm 0.3 --distance-mm 600 [--json]
  flash <animation.gif|apng|png|webp> --panel <panel type id> [--preset <id | file.json>] [--distance-mm N] [--json]
  legibility <image> --preset <built-in id | file.json> [--frame K] [--json]`;

function number(value: string | undefined, name: string, min: number, max: number, integer = false): number {
  const n = Number(value);
  if (value === undefined || !Number.isFinite(n) || n < min || n > max || (integer && !Number.isInteger(n))) {
    throw new UsageError(
      `--${name} must be ${integer ? 'a whole number' : 'a number'} from ${min} to ${max}, got ${value === undefined ? 'nothing' : `"${value}"`}`,
    );
  }
  return n;
}

async function loadPreset(ref: string): Promise<PanelParams> {
  const builtIn = builtInPresetById(ref);
  if (builtIn) return builtIn.parameters;
  if (!ref.endsWith('.json'))
    throw new UsageError(`--preset "${ref}" is neither a built-in preset id nor a .json file; \`presets\` lists the ids`);
  let doc: unknown;
  try {
    doc = JSON.parse(await readFile(ref, 'utf8'));
  } catch (err) {
    throw new UsageError(`--preset ${ref} could not be read as JSON: ${(err as Error).message}`);
  }
  const params = (doc as { parameters?: unknown })?.parameters ?? doc;
  const parsed = panelParamsSchema.safeParse(params);
  if (!parsed.success)
    throw new UsageError(
      `--preset ${ref} is not valid:\n${issuesOf(parsed.error)
        .map((i) => `  ${i.path}: ${i.message}`)
        .join('\n')}`,
    );
  return parsed.data;
}

async function render(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      preset: { type: 'string' },
      scale: { type: 'string', default: '3' },
      frame: { type: 'string', default: '0' },
      out: { type: 'string' },
    },
  });
  if (positionals.length !== 1) throw new UsageError('render takes one input image');
  if (!values.preset) throw new UsageError('render needs --preset');
  if (!values.out) throw new UsageError('render needs --out <file.png>');
  const parameters = await loadPreset(values.preset);
  const input = await readFile(positionals[0]).catch(() => {
    throw new UsageError(`cannot read ${positionals[0]}`);
  });
  const started = performance.now();
  const request = {
    input,
    parameters,
    scale: number(values.scale, 'scale', 1, 8, true),
    frame: number(values.frame, 'frame', 0, 100000, true),
  };
  // The same engine as the server: worker threads, one band of output rows per core.
  const engine = new RenderEngine();
  const { png, width, height } = await engine.render(request).finally(() => engine.close());
  await writeFile(values.out, png);
  console.error(`wrote ${values.out}: ${width} × ${height} in ${Math.round(performance.now() - started)} ms`);
}

function emission(args: string[]): void {
  const { values } = parseArgs({
    args,
    options: { peak: { type: 'string' }, fwhm: { type: 'string', default: '0' }, json: { type: 'boolean', default: false } },
  });
  const peakNm = number(values.peak, 'peak', 380, 780);
  const fwhmNm = number(values.fwhm, 'fwhm', 0, 200);
  const c = emissionColour(spectrumToXyz([{ peakNm, fwhmNm, weight: 1 }]));
  const round = (v: number) => Math.round(v * 1e5) / 1e5;
  if (values.json) console.log(JSON.stringify({ x: round(c.x), y: round(c.y), hex: c.hex }));
  else console.log(`${peakNm} nm, FWHM ${fwhmNm} nm: x ${c.x.toFixed(5)}, y ${c.y.toFixed(5)}, ${c.hex}`);
}

function presets(args: string[]): void {
  const { values } = parseArgs({ args, options: { json: { type: 'boolean', default: false } } });
  if (values.json) {
    console.log(JSON.stringify({ panelTypes: PANEL_TYPES, presets: BUILT_IN_PRESETS }, null, 2));
    return;
  }
  for (const t of PANEL_TYPES) {
    console.log(`${t.id}  ${t.name}`);
    for (const p of BUILT_IN_PRESETS.filter((x) => x.panelTypeId === t.id)) console.log(`    ${p.id}  ${p.name}`);
  }
}

function timingOf(values: { mode?: string; standard?: string }) {
  if (!values.mode) throw new UsageError('--mode is required, e.g. --mode 640x480@60');
  const standard = (values.standard ?? 'dmt') as Standard;
  if (!STANDARDS.includes(standard)) throw new UsageError(`--standard must be one of ${STANDARDS.join(', ')}, got "${values.standard}"`);
  try {
    return resolveTiming(values.mode, standard);
  } catch (err) {
    throw new UsageError((err as Error).message);
  }
}

function timing(args: string[]): void {
  const { values } = parseArgs({
    args,
    options: {
      mode: { type: 'string' },
      standard: { type: 'string' },
      'dual-scan': { type: 'boolean', default: false },
      'pixels-per-clock': { type: 'string', default: '1' },
      json: { type: 'boolean', default: false },
    },
  });
  const t = timingOf(values);
  const ppc = Number(values['pixels-per-clock']);
  if (!(PIXELS_PER_CLOCK as readonly number[]).includes(ppc))
    throw new UsageError(`--pixels-per-clock must be one of ${PIXELS_PER_CLOCK.join(', ')}, got "${values['pixels-per-clock']}"`);
  const iface: PanelInterface = { dualScan: values['dual-scan'] ?? false, pixelsPerClock: ppc as PanelInterface['pixelsPerClock'] };
  let panel;
  try {
    panel = interfaceFigures(t, iface);
  } catch (err) {
    throw new UsageError((err as Error).message);
  }
  const f = figures(t);
  const r = (v: number) => Math.round(v * 1e4) / 1e4;
  const doc = {
    pixelClockMHz: t.pixelClockMHz,
    h: t.h,
    v: t.v,
    hSyncPositive: t.hSyncPositive,
    vSyncPositive: t.vSyncPositive,
    lineRateKHz: r(f.lineRateKHz),
    refreshHz: r(f.refreshHz),
    shiftClockMHz: r(panel.shiftClockMHz),
  };
  if (values.json) console.log(JSON.stringify(doc));
  else {
    console.log(`${t.name} (${t.origin}): ${t.pixelClockMHz} MHz, ${doc.lineRateKHz} kHz, ${doc.refreshHz} Hz`);
    console.log(`  H ${t.h.active}/${t.h.frontPorch}/${t.h.sync}/${t.h.backPorch} = ${t.h.total} (${t.hSyncPositive ? '+' : '-'}sync)`);
    console.log(`  V ${t.v.active}/${t.v.frontPorch}/${t.v.sync}/${t.v.backPorch} = ${t.v.total} (${t.vSyncPositive ? '+' : '-'}sync)`);
    console.log(`  shift clock ${doc.shiftClockMHz} MHz (${iface.dualScan ? 'dual-scan, ' : ''}${iface.pixelsPerClock} px per clock)`);
  }
}

function registers(args: string[]): void {
  const { values } = parseArgs({
    args,
    options: { mode: { type: 'string' }, standard: { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  let regs;
  try {
    regs = vgaRegisters(timingOf(values));
  } catch (err) {
    throw err instanceof UsageError ? err : new UsageError((err as Error).message);
  }
  const crtc = regs.crtc.map((f) => hex2(f.value));
  if (values.json) console.log(JSON.stringify({ crtc, misc: hex2(regs.misc.value) }));
  else console.log(`CR00–CR18: ${crtc.join(' ')}\nmisc (3C2): ${hex2(regs.misc.value)}`);
}

const oneOf = <T extends string | number>(value: string | undefined, name: string, allowed: readonly T[], fallback?: T): T => {
  if (value === undefined && fallback !== undefined) return fallback;
  const match = allowed.find((a) => String(a) === value);
  if (match === undefined)
    throw new UsageError(`--${name} must be one of ${allowed.join(', ')}, got ${value === undefined ? 'nothing' : `"${value}"`}`);
  return match;
};

/** The packed cells of one image through a preset, in a controller's layout, written as bin, Intel HEX or a C header. */
async function frameDataCommand(args: string[]): Promise<void> {
  const options = {
    preset: { type: 'string' },
    bits: { type: 'string' },
    'bit-order': { type: 'string' },
    'pixels-per-clock': { type: 'string' },
    'dual-scan': { type: 'string' },
    frc: { type: 'string' },
    frame: { type: 'string', default: '0' },
    name: { type: 'string' },
    format: { type: 'string' },
    out: { type: 'string' },
  } as const;
  const { values, positionals } = parseArgs({ args, allowPositionals: true, options });
  if (positionals.length !== 1) throw new UsageError('frame-data takes one input image');
  if (!values.preset) throw new UsageError('frame-data needs --preset');
  if (!values.out) throw new UsageError('frame-data needs --out <file>');
  const format = oneOf(values.format, 'format', FRAME_DATA_FORMATS);
  const layout: FrameLayout = {
    bitsPerCell: oneOf(values.bits, 'bits', BITS_PER_CELL),
    bitOrder: oneOf(values['bit-order'], 'bit-order', ['msb', 'lsb'] as const, 'msb'),
    pixelsPerClock: oneOf(values['pixels-per-clock'], 'pixels-per-clock', PIXELS_PER_CLOCK, 1),
    scan:
      values['dual-scan'] === undefined
        ? 'single'
        : oneOf(values['dual-scan'], 'dual-scan', ['planes', 'interleaved'] as const) === 'planes'
          ? 'dual-planes'
          : 'dual-interleaved',
    frcLevels: values.frc === undefined ? 0 : number(values.frc, 'frc', 2, MAX_FRC_LEVELS, true),
  };
  const parameters = await loadPreset(values.preset);
  const input = await readFile(positionals[0]).catch(() => {
    throw new UsageError(`cannot read ${positionals[0]}`);
  });
  const { frames } = await decodeImage(input);
  const k = number(values.frame, 'frame', 0, frames.length - 1, true);
  let data;
  try {
    data = frameData(frames[k].image, parameters, layout);
  } catch (err) {
    throw err instanceof RangeError ? new UsageError(err.message) : err;
  }
  const name = values.name ?? path.basename(values.out).replace(/\.[^.]*$/, '');
  await writeFile(values.out, encodeFrameData(data, format, name));
  console.error(
    `wrote ${values.out}: ${FRAME_DATA_FORMAT_INFO[format].label}, ${data.frames} frame${data.frames > 1 ? 's' : ''} of ${data.frameBytes} bytes`,
  );
  for (const line of data.description) console.error(`  ${line}`);
}

/** A whole number given in decimal or as 0x… hex. */
function offsetArg(value: string | undefined, name: string): number | undefined {
  if (value === undefined) return undefined;
  const n = /^0x[0-9a-f]+$/i.test(value) ? parseInt(value.slice(2), 16) : /^\d+$/.test(value) ? Number(value) : NaN;
  if (!Number.isInteger(n)) throw new UsageError(`--${name} must be a whole number (decimal or 0x… hex), got "${value}"`);
  return n;
}

const hex = (n: number) => `0x${n.toString(16).toUpperCase().padStart(4, '0')}`;

async function readRomFile(file: string | undefined, tableOffset: number | undefined): Promise<{ bytes: Buffer; info: RomInfo }> {
  if (!file) throw new UsageError('give the ROM image file');
  const bytes = await readFile(file).catch(() => {
    throw new UsageError(`cannot read ${file}`);
  });
  return { bytes, info: readRom(bytes, { tableOffset }) };
}

/** Header, checksum and the VGA parameter table of an option ROM image. */
async function romInfo(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: { 'table-offset': { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new UsageError('rom-info takes one ROM image');
  const { info } = await readRomFile(positionals[0], offsetArg(values['table-offset'], 'table-offset'));
  const entries = info.entries.map((e) => ({
    index: e.index,
    offset: e.offset,
    status: e.status,
    standardMode: e.standardMode,
    width: e.decoded?.width ?? null,
    height: e.decoded?.height ?? null,
    pixelClockMHz: e.decoded?.pixelClockMHz ?? null,
    refreshHz: e.decoded?.refreshHz == null ? null : Math.round(e.decoded.refreshHz * 1000) / 1000,
    hTotal: e.decoded?.hTotal ?? null,
    vTotal: e.decoded?.vTotal ?? null,
    charWidth: e.decoded?.charWidth ?? null,
    memory: e.decoded?.memory ?? null,
    confidence: e.confidence,
  }));
  if (values.json) {
    console.log(
      JSON.stringify({
        size: info.size,
        fileBytes: info.fileBytes,
        checksumOk: info.checksum.ok,
        checksum: info.checksum,
        pci: info.pci,
        table: info.table,
        entries,
        notes: info.notes,
      }),
    );
    return;
  }
  console.log(
    `${info.size} bytes (${info.size / 512} blocks of 512); checksum ${info.checksum.ok ? 'good (sum 00)' : `BAD (sum ${hex2(info.checksum.sum)}, should be 00)`}`,
  );
  if (info.pci)
    console.log(
      `PCI data at ${hex(info.pci.offset)}: vendor ${hex(info.pci.vendorId)}, device ${hex(info.pci.deviceId)}, class ${info.pci.classCode.toString(16).padStart(6, '0')}`,
    );
  console.log(
    info.table
      ? `parameter table at ${hex(info.table.offset)} (${info.table.from === 'pointer' ? `from the save pointer table at ${hex(info.table.pointerAt!)}` : 'offset given'})`
      : 'parameter table: not pointed at; entries found by scanning',
  );
  for (const e of info.entries)
    if (e.status !== 'empty')
      console.log(
        `  ${hex2(e.index)}h at ${hex(e.offset)}  ${(e.standardMode ?? '').padEnd(26)} ${e.status === 'ok' ? describeEntry(e) : `unclear: ${e.decoded!.problems.join('; ')}`}`,
      );
  const empty = info.entries.filter((e) => e.status === 'empty').length;
  if (empty) console.log(`  (${empty} empty entries)`);
  for (const n of info.notes) console.log(`note: ${n}`);
}

/** Writes a timing into one entry of an image, fixes the checksum, and prints the byte diff. */
async function romPatch(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      entry: { type: 'string' },
      mode: { type: 'string' },
      standard: { type: 'string' },
      'table-offset': { type: 'string' },
      'checksum-at': { type: 'string' },
      out: { type: 'string' },
      json: { type: 'boolean', default: false },
    },
  });
  if (positionals.length !== 1) throw new UsageError('rom-patch takes one ROM image');
  const entry = offsetArg(values.entry, 'entry');
  if (entry === undefined) throw new UsageError('rom-patch needs --entry N (the index rom-info lists)');
  if (!values.out) throw new UsageError('rom-patch needs --out <patched.bin>');
  if (path.resolve(values.out) === path.resolve(positionals[0]))
    throw new UsageError('--out must be a new file: keep the original image beside the patched one');
  const t = timingOf(values);
  const { bytes, info } = await readRomFile(positionals[0], offsetArg(values['table-offset'], 'table-offset'));
  let patch;
  try {
    patch = patchRom(bytes, info, entry, t, { checksumAt: offsetArg(values['checksum-at'], 'checksum-at') });
  } catch (err) {
    throw err instanceof RangeError && !(err instanceof RomError)
      ? new UsageError(`a VGA CRT controller cannot hold ${t.name}: ${err.message}`)
      : err;
  }
  await writeFile(values.out, patch.bytes);
  if (values.json) {
    console.log(
      JSON.stringify({
        entry,
        offset: info.entries.find((e) => e.index === entry)!.offset,
        mode: t.name,
        changes: patch.changes,
        checksum: patch.checksum,
        notes: patch.notes,
      }),
    );
    return;
  }
  console.log(`entry ${hex2(entry)}h with ${t.name}: ${patch.changes.length} bytes changed, written to ${values.out}`);
  for (const c of patch.changes) console.log(`  ${hex(c.offset)}  ${hex2(c.old)} → ${hex2(c.new)}  ${c.field}`);
  for (const n of patch.notes) console.log(`note: ${n}`);
  console.log(
    'Keep the original image, verify the burned chip against the file, and have a way to recover (a second card or a programmer) before you flash.',
  );
}

/** Minutes of arc a cell subtends at a distance, and whether 20/20 vision resolves the cells. */
function acuityCommand(args: string[]): void {
  const { values } = parseArgs({
    args,
    options: { 'pitch-mm': { type: 'string' }, 'distance-mm': { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  const a = acuity(number(values['pitch-mm'], 'pitch-mm', 0.001, 1000), number(values['distance-mm'], 'distance-mm', 1, 1e6));
  const r = (v: number) => Math.round(v * 1e4) / 1e4;
  const doc = {
    arcminPerCell: r(a.arcminPerCell),
    cellsPerDegree: r(a.cellsPerDegree),
    resolvable: a.resolvable,
    limitDistanceMm: r(a.limitDistanceMm),
  };
  if (values.json) console.log(JSON.stringify(doc));
  else
    console.log(
      `${doc.arcminPerCell}′ a cell (${doc.cellsPerDegree} cells a degree): ${a.resolvable ? 'the cells are resolvable' : 'the cells blend'} at 20/20; they blend beyond ${Math.round(a.limitDistanceMm)} mm`,
    );
}

/** The flash check of an animation on a panel type, on the light the panel emits. */
async function flashCommand(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: {
      panel: { type: 'string' },
      preset: { type: 'string' },
      'distance-mm': { type: 'string', default: '600' },
      json: { type: 'boolean', default: false },
    },
  });
  if (positionals.length !== 1) throw new UsageError('flash takes one animation');
  if (!values.panel) throw new UsageError('flash needs --panel <panel type id>; `presets` lists them');
  const type = PANEL_TYPES.find((t) => t.id === values.panel);
  if (!type) throw new UsageError(`--panel "${values.panel}" is not a built-in panel type; \`presets\` lists them`);
  const parameters = values.preset ? await loadPreset(values.preset) : type.defaults;
  const distanceMm = number(values['distance-mm'], 'distance-mm', 50, 100_000);
  const input = await readFile(positionals[0]).catch(() => {
    throw new UsageError(`cannot read ${positionals[0]}`);
  });
  const { frames } = await decodeImage(input);
  const report = flashCheck(frames, parameters, distanceMm);
  const doc = {
    maxFlashesPerSecond: report.maxFlashesPerSecond,
    generalFlashFail: report.generalFlashFail,
    redFlashFail: report.redFlashFail,
    bt1702Fail: report.bt1702Fail,
    pass: report.pass,
    flashingSr: Math.round(report.flashingSr * 1e5) / 1e5,
    thresholdSr: report.thresholdSr,
    frames: frames.length,
  };
  if (values.json) {
    console.log(JSON.stringify(doc));
    return;
  }
  console.log(
    `${frames.length} frames on ${type.name} at ${distanceMm} mm: at most ${doc.maxFlashesPerSecond} flashes a second in one place`,
  );
  console.log(
    `  general flash (WCAG 2.2, 2.3.1): ${report.generalFlashFail ? 'FAILS' : 'passes'}; red flash: ${report.redFlashFail ? 'FAILS' : 'passes'}; ITU-R BT.1702: ${report.bt1702Fail ? 'FAILS' : 'passes'}`,
  );
  console.log(
    '  This check informs; it does not certify. Avoid flashing content where you can; the figures do not replace an assessment by a specialist.',
  );
}

/** How much one-cell contrast an image keeps through a look, on the simulated output. */
async function legibilityCommand(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({
    args,
    allowPositionals: true,
    options: { preset: { type: 'string' }, frame: { type: 'string', default: '0' }, json: { type: 'boolean', default: false } },
  });
  if (positionals.length !== 1) throw new UsageError('legibility takes one image');
  if (!values.preset) throw new UsageError('legibility needs --preset');
  const parameters = await loadPreset(values.preset);
  const input = await readFile(positionals[0]).catch(() => {
    throw new UsageError(`cannot read ${positionals[0]}`);
  });
  const { frames } = await decodeImage(input);
  const k = number(values.frame, 'frame', 0, frames.length - 1, true);
  const l = legibility(panelEmissions(frames, parameters)[k], parameters);
  const doc = { score: Math.round(l.score * 1e4) / 1e4, lostShare: Math.round(l.lostShare * 1e4) / 1e4, edges: l.edges };
  if (values.json) console.log(JSON.stringify(doc));
  else
    console.log(
      l.edges
        ? `${Math.round(l.score * 100)} % of one-cell contrast kept; ${(l.lostShare * 100).toFixed(1)} % of ${l.edges} detail edges below ${LOST_CONTRAST} Michelson contrast`
        : 'no one-cell detail in this image',
    );
}

/** Runs one CLI command; returns the process exit code. */
export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  try {
    if (command === 'render') await render(rest);
    else if (command === 'emission') emission(rest);
    else if (command === 'presets') presets(rest);
    else if (command === 'timing') timing(rest);
    else if (command === 'registers') registers(rest);
    else if (command === 'frame-data') await frameDataCommand(rest);
    else if (command === 'rom-info') await romInfo(rest);
    else if (command === 'rom-patch') await romPatch(rest);
    else if (command === 'acuity') acuityCommand(rest);
    else if (command === 'flash') await flashCommand(rest);
    else if (command === 'legibility') await legibilityCommand(rest);
    else throw new UsageError(command ? `unknown command "${command}"` : 'no command given');
    return 0;
  } catch (err) {
    if (err instanceof UsageError || (err as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      console.error(`error: ${(err as Error).message}\n\n${USAGE}`);
      return 2;
    }
    if (err instanceof AppError || err instanceof RomError) {
      console.error(`error: ${err.message}`);
      return 1;
    }
    throw err;
  }
}

if (require.main === module) {
  main(process.argv.slice(2)).then((code) => process.exit(code));
}
