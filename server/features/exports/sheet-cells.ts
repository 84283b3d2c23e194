import { composeSheet, differenceMap, fitNearest, SHEET_LAYOUT_LABELS, type SheetCell, type SheetInput } from '@shared/export/sheet';
import { PARAMS, type EnumSpec } from '@shared/model/parameters';
import { legibility, lightFigures } from '@shared/analysis/panel-report';
import { panelEmission, PIPELINE_VERSION } from '@shared/pipeline/render';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';
import type { Frame, RgbaImage } from '@shared/pipeline/types';
import { encodePng } from '../../render/encode';
import type { RenderRequest } from '../../render/render-engine';
import type { ExportDto, ExportFormat } from '@shared/api/export.schema';
import type { SheetSpec } from './export.model';
import { rendersZip, sheetPdf, type CellReport } from './sheet-files';
import { levelCount } from '@shared/pipeline/levels/spacing';

const ditherLabel = (PARAMS.find((p) => p.key === 'dither') as EnumSpec).optionLabels;
const plural = (n: number, one: string) => `${n} ${one}${n === 1 ? '' : 's'}`;

/** The words under a render: the look and its revision, the artwork and panel type, the key parameters. */
function renderLines(look: SheetSpec['looks'][number], artworkName: string): string[] {
  const { cell, drive, glass } = look.parameters;
  return [
    `${look.name}${look.revision ? ` · r${look.revision}` : ''}`,
    `${artworkName} · ${look.panelTypeName}`,
    `${cell.cols} × ${cell.rows} · ${levelCount(drive)} levels${drive.levelSpacing === 'linear' ? '' : drive.levelSpacing === 'table' ? ' (duty table)' : ' (to the eye)'} · ${ditherLabel[drive.dither]} · glow ${glass.glowRadiusMm} mm`,
  ];
}

/** The analysis of one cell (the frame's emission through the look). */
export function cellReport(frames: readonly Frame[], look: SheetSpec['looks'][number], frame: number): CellReport {
  const emission = panelEmission(frames, look.parameters, frame);
  const { score, lostShare, edges } = legibility(emission, look.parameters);
  return { legibility: { score, lostShare, edges }, light: lightFigures([emission], look.parameters)[0] };
}

/** The two label lines of a cell's analysis. */
function reportLines(r: CellReport): string[] {
  const { legibility: l, light } = r;
  return [
    l.edges
      ? `legibility ${Math.round(l.score * 100)} % of one-cell contrast · ${(l.lostShare * 100).toFixed(1)} % of detail lost`
      : 'legibility: no one-cell detail in this frame',
    `${light.meanCdM2.toFixed(1)} cd/m² mean · ${light.peakCdM2.toFixed(0)} peak · ${(light.litShare * 100).toFixed(1)} % lit · power ${(light.relativePower * 100).toFixed(1)} %`,
  ];
}

/** Image pixels per millimetre of panel at the sheet's scale (scale pixels a cell pitch across). */
const pxPerMm = (look: SheetSpec['looks'][number], scale: number) => scale / look.parameters.cell.pitchXMm;

/**
 * The cells of a sheet from its renders (renders[artwork][look]) and the artworks' frames, by
 * layout: a grid of renders; the original then each look; or A, B and their difference map.
 */
export function sheetInput(
  spec: SheetSpec,
  title: string,
  renders: RgbaImage[][],
  originals: RgbaImage[],
  made: { at: Date; by: string },
  reports: CellReport[][] | null = null,
): { input: SheetInput; figures: ExportDto['figures'] } {
  const figures: NonNullable<ExportDto['figures']> = [];
  const rows: SheetCell[][] = spec.artworks.map((artwork, r) => {
    const rendered = spec.looks.map((look, l): SheetCell => ({
      image: renders[r][l],
      lines: [...renderLines(look, artwork.name), ...(reports ? reportLines(reports[r][l]) : [])],
      pxPerMm: pxPerMm(look, spec.scale),
    }));
    if (spec.layout === 'grid') return rendered;
    if (spec.layout === 'side-by-side') {
      const box = renders[r][0];
      const original = originals[r];
      return [
        {
          image: fitNearest(original, box.width, box.height),
          lines: ['Original', artwork.name, `${original.width} × ${original.height} px, as drawn`],
        },
        ...rendered,
      ];
    }
    const { image, diff } = differenceMap(renders[r][0], renders[r][1]);
    figures.push({ artworkName: artwork.name, differing: diff.differing, pixels: diff.pixels, maxChannel: diff.maxChannel });
    const share = (100 * diff.differing) / diff.pixels;
    return [
      { ...rendered[0], lines: [`A: ${rendered[0].lines[0]}`, ...rendered[0].lines.slice(1)] },
      { ...rendered[1], lines: [`B: ${rendered[1].lines[0]}`, ...rendered[1].lines.slice(1)] },
      {
        image,
        lines: [
          'Difference A/B',
          `${diff.differing.toLocaleString('en')} pixels differ (${share.toFixed(share < 1 ? 3 : 1)} %)`,
          `largest channel difference ${diff.maxChannel}`,
        ],
        pxPerMm: pxPerMm(spec.looks[0], spec.scale),
      },
    ];
  });
  const date = made.at.toISOString().slice(0, 16).replace('T', ' ');
  return {
    input: {
      title,
      subtitle: `${SHEET_LAYOUT_LABELS[spec.layout]} · ${plural(spec.artworks.length, 'artwork')} × ${plural(spec.looks.length, 'look')} · frame ${spec.frame + 1} · ${spec.scale} px a cell pitch`,
      footer: [
        `${spec.studioName} · ${date} UTC · made by ${made.by}`,
        `Emberline panel model v${PIPELINE_VERSION} · scale bars in mm of panel`,
      ],
      rows,
    },
    figures: spec.layout === 'ab-diff' ? figures : null,
  };
}

/** What making a sheet needs from outside: renders, decoded frames, and a word before each step. */
export interface SheetWork {
  spec: SheetSpec;
  title: string;
  made: { at: Date; by: string };
  /** Each artwork's stored file, in spec order. */
  sources: { input: Buffer; sheet: SpriteSheet | null }[];
  render(req: RenderRequest): Promise<RgbaImage>;
  frames(input: Buffer, sheet: SpriteSheet | null): Promise<Frame[]>;
  /** Called before cell `done` (0-based; `done` = cells before putting the sheet together); false stops the work. */
  beforeStep(done: number, step: string): Promise<boolean>;
}

/** Renders every cell in order and puts the sheet together: its files by format; null when beforeStep said stop. */
export async function makeSheet(
  work: SheetWork,
): Promise<{ files: Partial<Record<ExportFormat, Buffer>>; width: number; height: number; figures: ExportDto['figures'] } | null> {
  const { spec } = work;
  const cells = spec.artworks.length * spec.looks.length;
  const renders: RgbaImage[][] = [];
  // Each cell's own PNG (for the ZIP) is encoded by sharp's threads while the pool renders the next.
  const singles: Promise<{ png: Buffer; width: number; height: number }>[][] = [];
  const originals: RgbaImage[] = [];
  const reports: CellReport[][] = [];
  let done = 0;
  for (const [r, artwork] of spec.artworks.entries()) {
    const { input, sheet } = work.sources[r];
    const frames = await work.frames(input, sheet);
    originals.push(frames[spec.frame].image);
    if (spec.report) reports.push(spec.looks.map((look) => cellReport(frames, look, spec.frame)));
    const row: RgbaImage[] = [];
    const encoded: Promise<{ png: Buffer; width: number; height: number }>[] = [];
    for (const look of spec.looks) {
      if (!(await work.beforeStep(done, `Cell ${done + 1} of ${cells}: “${artwork.name}” through “${look.name}”`))) {
        await Promise.allSettled(singles.flat().concat(encoded));
        return null;
      }
      const image = await work.render({ input, sheet, parameters: look.parameters, scale: spec.scale, frame: spec.frame });
      row.push(image);
      encoded.push(encodePng(image).then((png) => ({ png, width: image.width, height: image.height })));
      done++;
    }
    renders.push(row);
    singles.push(encoded);
  }
  if (!(await work.beforeStep(done, 'Putting the sheet together'))) return null;
  const { input, figures } = sheetInput(spec, work.title, renders, originals, work.made, spec.report ? reports : null);
  const { image } = composeSheet(input);
  const png = await encodePng(image);
  const [pdf, zip] = await Promise.all([
    sheetPdf(spec, work.title, work.made, { png, width: image.width, height: image.height }, figures),
    Promise.all(singles.map((row) => Promise.all(row))).then((cells) =>
      rendersZip(spec, work.title, work.made.at, cells, figures, spec.report ? reports : null),
    ),
  ]);
  return { files: { png, pdf, zip }, width: image.width, height: image.height, figures };
}
