import { readFile, writeFile } from 'node:fs/promises';
import { parseArgs } from 'node:util';
import { emissionColour, spectrumToXyz } from '../../shared/color/emission';
import { BUILT_IN_PRESETS, builtInPresetById, PANEL_TYPES } from '../../shared/model/panel-types';
import { panelParamsSchema, type PanelParams } from '../../shared/model/parameters';
import { AppError } from '../core/app-error';
import { issuesOf } from '../core/validate';
import { renderReference } from '../render/reference-renderer';

/** A usage error: printed with the usage line, exit code 2. */
class UsageError extends Error {}

const USAGE = `usage: npm run -s cli -- <command> [options]

commands:
  render <in.png|gif|jpg|webp> --preset <built-in id | file.json> [--scale N] [--frame K] --out <out.png>
  emission --peak <nm> [--fwhm <nm>] [--json]
  presets [--json]`;

function number(value: string | undefined, name: string, min: number, max: number, integer = false): number {
  const n = Number(value);
  if (value === undefined || !Number.isFinite(n) || n < min || n > max || (integer && !Number.isInteger(n))) {
    throw new UsageError(`--${name} must be ${integer ? 'a whole number' : 'a number'} from ${min} to ${max}, got ${value === undefined ? 'nothing' : `"${value}"`}`);
  }
  return n;
}

async function loadPreset(ref: string): Promise<PanelParams> {
  const builtIn = builtInPresetById(ref);
  if (builtIn) return builtIn.parameters;
  if (!ref.endsWith('.json')) throw new UsageError(`--preset "${ref}" is neither a built-in preset id nor a .json file; \`presets\` lists the ids`);
  let doc: unknown;
  try {
    doc = JSON.parse(await readFile(ref, 'utf8'));
  } catch (err) {
    throw new UsageError(`--preset ${ref} could not be read as JSON: ${(err as Error).message}`);
  }
  const params = (doc as { parameters?: unknown })?.parameters ?? doc;
  const parsed = panelParamsSchema.safeParse(params);
  if (!parsed.success) throw new UsageError(`--preset ${ref} is not valid:\n${issuesOf(parsed.error).map((i) => `  ${i.path}: ${i.message}`).join('\n')}`);
  return parsed.data;
}

async function render(args: string[]): Promise<void> {
  const { values, positionals } = parseArgs({ args, allowPositionals: true, options: { preset: { type: 'string' }, scale: { type: 'string', default: '3' }, frame: { type: 'string', default: '0' }, out: { type: 'string' } } });
  if (positionals.length !== 1) throw new UsageError('render takes one input image');
  if (!values.preset) throw new UsageError('render needs --preset');
  if (!values.out) throw new UsageError('render needs --out <file.png>');
  const parameters = await loadPreset(values.preset);
  const input = await readFile(positionals[0]).catch(() => {
    throw new UsageError(`cannot read ${positionals[0]}`);
  });
  const started = performance.now();
  const { png, width, height } = await renderReference({ input, parameters, scale: number(values.scale, 'scale', 1, 8, true), frame: number(values.frame, 'frame', 0, 100000, true) });
  await writeFile(values.out, png);
  console.error(`wrote ${values.out}: ${width} × ${height} in ${Math.round(performance.now() - started)} ms`);
}

function emission(args: string[]): void {
  const { values } = parseArgs({ args, options: { peak: { type: 'string' }, fwhm: { type: 'string', default: '0' }, json: { type: 'boolean', default: false } } });
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

/** Runs one CLI command; returns the process exit code. */
export async function main(argv: string[]): Promise<number> {
  const [command, ...rest] = argv;
  try {
    if (command === 'render') await render(rest);
    else if (command === 'emission') emission(rest);
    else if (command === 'presets') presets(rest);
    else throw new UsageError(command ? `unknown command "${command}"` : 'no command given');
    return 0;
  } catch (err) {
    if (err instanceof UsageError || (err as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
      console.error(`error: ${(err as Error).message}\n\n${USAGE}`);
      return 2;
    }
    if (err instanceof AppError) {
      console.error(`error: ${err.message}`);
      return 1;
    }
    throw err;
  }
}

if (require.main === module) {
  main(process.argv.slice(2)).then((code) => process.exit(code));
}
