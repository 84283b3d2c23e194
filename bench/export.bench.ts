// `npm run bench:export`: a 3 × 3 comparison sheet of 640 × 480 panels at scale 2, made as the
// export job makes it (the render pool, then the sheet put together and encoded), against one
// pooled reference render. A benchmark, not a test: a table, then one JSON line of figures.
import os from 'node:os';
import { builtInPresetById, panelTypeById } from '@shared/model/panel-types';
import type { SheetSpec } from '../server/features/exports/export.model';
import { makeSheet } from '../server/features/exports/sheet-cells';
import { RenderEngine } from '../server/render/render-engine';
import { pngOf } from '../server/testing/images';
import { medianMs } from './timing';

const RUNS = 5;
const WARM_UPS = 2;
const time = (fn: () => Promise<unknown>) => medianMs(fn, RUNS, WARM_UPS);

async function main() {
  // Three 640 × 480 cards drawn here: a ramp, a checker, fine lines.
  const cards = [
    pngOf(640, 480, (x) => [Math.round((x / 639) * 255), Math.round((x / 639) * 255), Math.round((x / 639) * 255), 255]),
    pngOf(640, 480, (x, y) => (((x >> 3) + (y >> 3)) % 2 ? [255, 255, 255, 255] : [0, 0, 0, 255])),
    pngOf(640, 480, (x, y) => (x % 4 === 0 || y % 6 === 0 ? [255, 255, 255, 255] : [40, 40, 40, 255])),
  ];
  const looks = ['el-amber-640x480.standard', 'el-amber-640x480.ordered', 'crt-green-p1.standard'].map((id) => {
    const p = builtInPresetById(id)!;
    return {
      id,
      name: p.name,
      revision: null,
      panelTypeId: p.panelTypeId,
      panelTypeName: panelTypeById(p.panelTypeId)!.name,
      parameters: p.parameters,
    };
  });
  const scale = 2;
  const spec: SheetSpec = {
    studioName: 'Bench studio',
    layout: 'grid',
    scale,
    frame: 0,
    report: false,
    artworks: cards.map((_, k) => ({ id: String(k), name: `Card ${k + 1}` })),
    looks,
  };
  const engine = new RenderEngine();
  const sources = cards.map((input) => ({ input, sheet: null }));

  // One pooled reference render of one cell, PNG included (what POST /renders does).
  const pooledRenderMs = await time(() => engine.render({ input: cards[1], parameters: looks[0].parameters, scale, frame: 0 }));
  let size = { width: 0, height: 0, bytes: 0 };
  const sheetMs = await time(async () => {
    const sheet = await makeSheet({
      spec,
      title: 'Benchmark sheet',
      made: { at: new Date(0), by: 'bench' },
      sources,
      render: (req) => engine.renderImage(req),
      frames: (input, sheet) => engine.decodedFrames(input, sheet),
      beforeStep: async () => true,
    });
    size = { width: sheet!.width, height: sheet!.height, bytes: sheet!.files.png!.length };
  });
  await engine.close();

  const cells = spec.artworks.length * spec.looks.length;
  const perCellMs = sheetMs / cells;
  console.log(
    `median of ${RUNS} runs after ${WARM_UPS} warm-ups, ${process.version}, ${os.cpus().length} cores, ${engine.threads} render threads`,
  );
  console.log('| step | ms |\n| --- | ---: |');
  console.log(`| one pooled reference render, 640×480 → 1280×960 PNG | ${pooledRenderMs.toFixed(1)} |`);
  console.log(
    `| 3 × 3 sheet, ${size.width} × ${size.height} px: PNG (${(size.bytes / 1024 / 1024).toFixed(1)} MiB), PDF and ZIP of the single renders | ${sheetMs.toFixed(1)} |`,
  );
  console.log(`| per cell (sheet / 9) | ${perCellMs.toFixed(1)} |`);
  console.log(`| per cell ÷ pooled render | ${(perCellMs / pooledRenderMs).toFixed(3)} |`);
  console.log(
    JSON.stringify({
      sheetMs: +sheetMs.toFixed(1),
      perCellMs: +perCellMs.toFixed(1),
      pooledRenderMs: +pooledRenderMs.toFixed(1),
      perCellToRender: +(perCellMs / pooledRenderMs).toFixed(3),
      sheetWidth: size.width,
      sheetHeight: size.height,
    }),
  );
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
