// Panel match: the time to fit a 640 × 480 panel type to a photo of its match pattern (a synthetic
// photo made from the pipeline, about 4.5 photo pixels a cell), stage by stage.
import os from 'node:os';
import { fitPanel } from '@shared/match/fit';
import { patternFor } from '@shared/match/pattern';
import { panelTypeById } from '@shared/model/panel-types';
import { mergeParams } from '@shared/model/parameters';
import { syntheticPhoto } from '@shared/testing/synthetic-photo';
import { median } from './timing';

const RUNS = 3;

async function main(): Promise<void> {
  const base = panelTypeById('el-amber-640x480')!.defaults;
  const truth = mergeParams(base, {
    cell: { fillX: 0.66, fillY: 0.7 },
    glass: { glowRadiusMm: 0.32, glowShare: 0.16, haloRadiusMm: 1.6, haloShare: 0.05 },
    emission: { colourSource: 'chromaticity', chromaX: 0.5, chromaY: 0.42 },
  });
  const t0 = performance.now();
  const photo = await syntheticPhoto(truth, {
    scale: 5,
    width: 3200,
    height: 2500,
    corners: [
      [150, 140],
      [3040, 200],
      [3000, 2360],
      [190, 2300],
    ],
    exposure: 0.8,
    ambient: 0.01,
    blur: 0.8,
    noise: 0.01,
    quality: 90,
    seed: 11,
    layout: patternFor(base),
  });
  const photoMs = performance.now() - t0;
  const stages = new Map<string, number[]>();
  const totals: number[] = [];
  let result: ReturnType<typeof fitPanel> | undefined;
  for (let run = 0; run < RUNS; run++) {
    let last = performance.now();
    let step = '';
    const start = last;
    const seen = new Map<string, number>();
    result = fitPanel(
      { photo: photo.image, marks: photo.fiducials, base, options: { camera: { kind: 'srgb' }, activeWidthMm: 192, activeHeightMm: 144 } },
      (_share, next) => {
        if (next === step) return;
        const now = performance.now();
        if (step) seen.set(step, (seen.get(step) ?? 0) + now - last);
        [step, last] = [next, now];
      },
    );
    const end = performance.now();
    seen.set(step, (seen.get(step) ?? 0) + end - last);
    for (const [k, v] of seen) stages.set(k, [...(stages.get(k) ?? []), v]);
    totals.push(end - start);
  }
  const matchMs = median(totals);
  const glow = result!.fitted.find((f) => f.key === 'glowRadiusMm')!;
  console.log(
    `median of ${RUNS} fits, ${process.version}, ${os.cpus().length} cores; photo ${photo.image.width} × ${photo.image.height} px (${result!.quality.pixelsPerCell.toFixed(1)} px a cell), made in ${photoMs.toFixed(0)} ms`,
  );
  console.log('| stage | ms |\n| --- | ---: |');
  for (const [k, v] of stages) console.log(`| ${k} | ${median(v).toFixed(0)} |`);
  console.log(`| whole fit, 640 × 480 panel | ${matchMs.toFixed(0)} |`);
  console.log(`| glow radius found (true 0.32 mm) | ${glow.value.toFixed(3)} ± ${glow.uncertainty.toFixed(3)} mm |`);
  console.log(
    JSON.stringify({
      matchMs: +matchMs.toFixed(0),
      photoWidth: photo.image.width,
      photoHeight: photo.image.height,
      pixelsPerCell: +result!.quality.pixelsPerCell.toFixed(2),
      iterations: result!.quality.iterations,
      glowRadiusMm: glow.value,
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
