// `npm run bench:render`: reference render timing (a benchmark, not a test). Prints a table and,
// as the last line, one JSON object of figures.
import sharp from 'sharp';
import { builtInPresetById } from '@shared/model/panel-types';
import { mergeParams, type PanelParams } from '@shared/model/parameters';
import { decodeImage } from '../server/render/decode';
import { bandBuffer, renderPng } from '../server/render/png';
import { RenderEngine, type RenderRequest } from '../server/render/render-engine';
import { renderCpu } from '@shared/pipeline/render';
import { panelEmission, panelGlow } from '@shared/pipeline/render';
import { compose } from '@shared/pipeline/output/compose';
import { outputUniforms } from '@shared/pipeline/output/uniforms';
import { pngOf } from '../server/testing/images';
import { median, medianMs } from './timing';

const RUNS = 7;
/**
 * Runs before the timed ones. The server's render workers live for hours, so what matters is the
 * speed once the JIT has compiled the hot loops and the reused buffers exist: about five renders.
 */
const WARM_UPS = 5;
const time = (fn: () => Promise<unknown>) => medianMs(fn, RUNS, WARM_UPS);

async function main() {
  // A 640 × 480 test card: gradients, checkers and fine lines, drawn here.
  const input = pngOf(640, 480, (x, y) => {
    const v =
      y < 160 ? Math.round((x / 639) * 255) : y < 320 ? (((x >> 3) + (y >> 3)) % 2 ? 255 : 0) : x % 4 === 0 || y % 6 === 0 ? 255 : 40;
    return [v, v, v, 255];
  });
  const base = builtInPresetById('el-amber-640x480.standard')!.parameters;
  const withGlow = (mm: number): PanelParams => mergeParams(base, { glass: { glowRadiusMm: mm } });
  const scale = 3;
  // Single thread: decode, the whole CPU pipeline and the PNG file (one band) on this thread,
  // composed straight into the PNG writer's buffer as the pool's bands are (the glow radius does
  // not change the output's size).
  const u = outputUniforms(base, scale);
  const singleThread = async (parameters: PanelParams) =>
    renderPng(renderCpu((await decodeImage(input)).frames, parameters, { scale, out: bandBuffer(u.width, u.height) }));
  // The sharp baseline is timed right before the render it is compared with: this machine's speed
  // drifts by up to a third over tens of seconds, and the ratio is meant to compare the two, not
  // the machine at two moments. (Each has its own warm-ups, so neither runs in the other's
  // garbage collection.)
  const frames = (await decodeImage(input)).frames;
  let image = compose(panelEmission(frames, base), panelGlow(panelEmission(frames, base), base), u);
  const sigmaPx = (base.glass.glowRadiusMm / base.cell.pitchXMm) * scale;
  const raw = Buffer.from(image.data.buffer);
  const sharpBaselineMs = await time(() =>
    sharp(raw, { raw: { width: u.width, height: u.height, channels: 4 } })
      .blur(sigmaPx)
      .png({ compressionLevel: 2, adaptiveFiltering: false })
      .toBuffer(),
  );
  const renderMs = await time(() => singleThread(base));
  const small = await time(() => singleThread(withGlow(0.2)));
  const large = await time(() => singleThread(withGlow(5)));

  // The server's engine: worker threads, output rows split in bands across them (decoded frames cached).
  const engine = new RenderEngine();
  const request = (p: PanelParams): RenderRequest => ({ input, parameters: p, scale, frame: 0 });
  const parallelRenderMs = await time(() => engine.render(request(base)));
  // Batches of 8 requests at once: renders a second, and how long the first, middle and last of
  // each batch took to come back (the pool's queue runs earlier renders' steps first).
  const inFlight = 8;
  const batches = 3;
  const started = performance.now();
  const waits: number[][] = [];
  for (let b = 0; b < batches; b++) {
    const sent = performance.now();
    const back = await Promise.all(
      Array.from({ length: inFlight }, (_, i) =>
        engine
          .render(request(mergeParams(base, { viewing: { exposureEv: (b * inFlight + i) / 100 } })))
          .then(() => performance.now() - sent),
      ),
    );
    waits.push(back.sort((x, y) => x - y));
  }
  const throughputPerS = (inFlight * batches) / ((performance.now() - started) / 1000);
  const waitMs = (k: number) => median(waits.map((w) => w[k]));
  await engine.close();

  // Stage split of one render.
  let emission: Float32Array = new Float32Array();
  let glow = panelGlow(panelEmission(frames, base), base);
  const decodeMs = await time(() => decodeImage(input));
  const panelMs = await time(async () => (emission = panelEmission(frames, base)));
  const glowMs = await time(async () => (glow = panelGlow(emission, base)));
  const composeMs = await time(async () => (image = compose(emission, glow, u)));
  const encodeMs = await time(async () => renderPng(image));

  const rows: [string, number][] = [
    ['full render, 640×480 → 1920×1440 PNG, one thread', renderMs],
    [`full render on the pool (${engine.threads} threads, row bands deflated there)`, parallelRenderMs],
    ['  decode input', decodeMs],
    ['  panel stages (fit, tone, levels, row loading)', panelMs],
    ['  glow field', glowMs],
    ['  output stages (cells, glow, colour, light, encode8)', composeMs],
    ['  PNG file (scanlines, deflate level 2, one band)', encodeMs],
    ['full render, glow radius 0.2 mm', small],
    ['full render, glow radius 5 mm', large],
    [`sharp blur(σ = ${sigmaPx.toFixed(2)} px) + PNG, same size`, sharpBaselineMs],
  ];
  console.log(`median of ${RUNS} runs after ${WARM_UPS} warm-ups, ${process.version}, ${(await import('node:os')).cpus().length} cores`);
  console.log('| step | ms |\n| --- | ---: |');
  for (const [name, ms] of rows) console.log(`| ${name} | ${ms.toFixed(1)} |`);
  console.log(`| renders per second, ${inFlight} in flight on the pool | ${throughputPerS.toFixed(2)} /s |`);
  console.log(
    `| ${inFlight} sent at once: first, middle and last back (median of ${batches} batches) | ${[0, inFlight / 2, inFlight - 1].map((k) => waitMs(k).toFixed(0)).join(', ')} ms |`,
  );
  const figures = {
    renderMs: +renderMs.toFixed(1),
    parallelRenderMs: +parallelRenderMs.toFixed(1),
    throughputPerS: +throughputPerS.toFixed(2),
    inFlightWaitMs: { first: Math.round(waitMs(0)), middle: Math.round(waitMs(inFlight / 2)), last: Math.round(waitMs(inFlight - 1)) },
    radiusRatio: +(large / small).toFixed(3),
    sharpBaselineMs: +sharpBaselineMs.toFixed(1),
    ratioToSharp: +(renderMs / sharpBaselineMs).toFixed(3),
    peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024),
    stagesMs: {
      decode: +decodeMs.toFixed(1),
      panel: +panelMs.toFixed(1),
      glow: +glowMs.toFixed(1),
      compose: +composeMs.toFixed(1),
      encode: +encodeMs.toFixed(1),
    },
  };
  console.log(JSON.stringify(figures));
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
