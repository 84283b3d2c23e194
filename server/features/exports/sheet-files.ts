import archiver from 'archiver';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { inflateSync } from 'node:zlib';
import PDFDocument from 'pdfkit';
import type { LightFrame } from '@shared/analysis/panel-report';
import type { ExportDto } from '@shared/api/export.schema';
import { SHEET_LAYOUT_LABELS } from '@shared/export/sheet';
import { PIPELINE_VERSION } from '@shared/pipeline/render';
import type { SheetSpec } from './export.model';
import { lookManifest } from './export-files';

/** A render's analysis, as the bench's report computes it: legibility of one-cell detail, and light and power. */
export interface CellReport {
  legibility: { score: number; lostShare: number; edges: number };
  light: LightFrame;
}

/** The manifest's own format name, beside the preset documents it holds. */
export const MANIFEST_FORMAT = 'emberline.sheet-manifest';

const FONT_DIR = path.join(path.dirname(require.resolve('@fontsource/inter/package.json')), 'files');
/**
 * Inter (SIL OFL 1.1) as the PDF's one font, unpacked from WOFF to TrueType once: the PDF library
 * would otherwise inflate every table again for each document.
 */
const INTER = woffToSfnt(readFileSync(path.join(FONT_DIR, 'inter-latin-400-normal.woff')));

/**
 * A WOFF 1.0 file as the TrueType/OpenType font it wraps (W3C WOFF File Format 1.0, §§ 3–5): the
 * header's flavor and table directory become an sfnt offset table, each table inflated when its
 * compressed length is below its original one, tables 4-byte aligned.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.readUInt32BE(0) !== 0x774f4646) throw new Error('not a WOFF 1.0 file (signature wOFF)');
  const numTables = woff.readUInt16BE(12);
  const entries = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20;
    const [offset, compLength, origLength] = [woff.readUInt32BE(at + 4), woff.readUInt32BE(at + 8), woff.readUInt32BE(at + 12)];
    const raw = woff.subarray(offset, offset + compLength);
    return { tag: woff.readUInt32BE(at), checksum: woff.readUInt32BE(at + 16), data: compLength < origLength ? inflateSync(raw) : raw };
  });
  const head = 12 + 16 * numTables;
  const out = Buffer.alloc(head + entries.reduce((n, e) => n + ((e.data.length + 3) & ~3), 0));
  const pow2 = 2 ** Math.floor(Math.log2(numTables));
  out.writeUInt32BE(woff.readUInt32BE(4), 0);
  out.writeUInt16BE(numTables, 4);
  out.writeUInt16BE(pow2 * 16, 6);
  out.writeUInt16BE(Math.log2(pow2), 8);
  out.writeUInt16BE(numTables * 16 - pow2 * 16, 10);
  let offset = head;
  entries.forEach((e, i) => {
    out.writeUInt32BE(e.tag, 12 + i * 16);
    out.writeUInt32BE(e.checksum, 16 + i * 16);
    out.writeUInt32BE(offset, 20 + i * 16);
    out.writeUInt32BE(e.data.length, 24 + i * 16);
    e.data.copy(out, offset);
    offset += (e.data.length + 3) & ~3;
  });
  return out;
}
/** Pixels of the sheet per inch of the PDF page. */
const PDF_DPI = 150;

/** A name safe in a ZIP on any system: letters, digits, spaces, dots and dashes. */
const safe = (s: string) =>
  s
    .replace(/[^\w .-]+/g, '_')
    .replace(/\s+/g, ' ')
    .trim()
    .slice(0, 60) || 'untitled';

/** The renders' file names in the ZIP, by row then column: "r1-c2 Title screen - Soft glow.png". */
export function renderFileNames(spec: SheetSpec): string[][] {
  return spec.artworks.map((a, r) =>
    spec.looks.map((l, c) => `renders/r${r + 1}-c${c + 1} ${safe(a.name)} - ${safe(l.name)}${l.revision ? ` r${l.revision}` : ''}.png`),
  );
}

/**
 * The single renders as PNG files and a manifest.json that says what each is: artwork, look (a
 * preset document, the format of preset export and import) and size, with the sheet's figures.
 */
export async function rendersZip(
  spec: SheetSpec,
  title: string,
  createdAt: Date,
  renders: { png: Buffer; width: number; height: number }[][],
  figures: ExportDto['figures'],
  reports: CellReport[][] | null = null,
): Promise<Buffer> {
  const names = renderFileNames(spec);
  const manifest = {
    format: MANIFEST_FORMAT,
    version: 1,
    title,
    studio: spec.studioName,
    createdAt: createdAt.toISOString(),
    layout: spec.layout,
    scale: spec.scale,
    frame: spec.frame,
    pipelineVersion: PIPELINE_VERSION,
    cells: spec.artworks.flatMap((artwork, r) =>
      spec.looks.map((look, c) => ({
        file: names[r][c],
        row: r,
        column: c,
        artwork,
        width: renders[r][c].width,
        height: renders[r][c].height,
        look: lookManifest(look),
        ...(reports ? { report: reports[r][c] } : {}),
      })),
    ),
    figures,
  };
  const zip = archiver('zip', { zlib: { level: 1 } });
  const chunks: Buffer[] = [];
  zip.on('data', (d: Buffer) => chunks.push(d));
  const finished = new Promise<void>((resolve, reject) => {
    zip.on('end', () => resolve());
    zip.on('error', reject);
  });
  // PNGs are compressed already: stored, not deflated again.
  renders.forEach((row, r) => row.forEach((cell, c) => zip.append(cell.png, { name: names[r][c], store: true, date: createdAt })));
  zip.append(`${JSON.stringify(manifest, null, 2)}\n`, { name: 'manifest.json', date: createdAt });
  await zip.finalize();
  await finished;
  return Buffer.concat(chunks);
}

/**
 * The sheet as a one-page PDF for clients: the title and what the sheet shows in real text (Inter,
 * shipped with the app and embedded), the sheet image at 150 pixels per inch, and a note on scale.
 */
export async function sheetPdf(
  spec: SheetSpec,
  title: string,
  made: { at: Date; by: string },
  sheet: { png: Buffer; width: number; height: number },
  figures: ExportDto['figures'],
): Promise<Buffer> {
  const margin = 36;
  const imageWidth = (sheet.width * 72) / PDF_DPI;
  const imageHeight = (sheet.height * 72) / PDF_DPI;
  const textBlock = 96 + (figures?.length ?? 0) * 14;
  const doc = new PDFDocument({
    size: [imageWidth + 2 * margin, imageHeight + 2 * margin + textBlock],
    margin,
    info: {
      Title: title,
      Author: made.by,
      Subject: `${SHEET_LAYOUT_LABELS[spec.layout]} (Emberline comparison sheet)`,
      Creator: 'Emberline',
      CreationDate: made.at,
    },
  });
  const chunks: Buffer[] = [];
  doc.on('data', (d: Buffer) => chunks.push(d));
  const finished = new Promise<void>((resolve) => doc.on('end', () => resolve()));
  doc.registerFont('Inter', INTER);
  doc.font('Inter').fontSize(20).fillColor('#1b1714').text(title, { width: imageWidth });
  doc.fontSize(10).fillColor('#5b524a');
  doc.text(
    `${spec.studioName} · ${SHEET_LAYOUT_LABELS[spec.layout]} · ${spec.artworks.length} × ${spec.looks.length} cells · frame ${spec.frame + 1} · made by ${made.by}, ${made.at.toISOString().slice(0, 16).replace('T', ' ')} UTC`,
    { width: imageWidth },
  );
  doc.text(`Looks: ${spec.looks.map((l) => `${l.name}${l.revision ? ` r${l.revision}` : ''} (${l.panelTypeName})`).join('; ')}`, {
    width: imageWidth,
  });
  for (const f of figures ?? [])
    doc.text(
      `${f.artworkName}: ${f.differing.toLocaleString('en')} of ${f.pixels.toLocaleString('en')} pixels differ; largest channel difference ${f.maxChannel}`,
      { width: imageWidth },
    );
  doc.text(
    `Rendered at ${spec.scale} px a cell pitch and placed at ${PDF_DPI} px an inch: the scale bars under the cells measure millimetres of panel. Emberline panel model v${PIPELINE_VERSION}.`,
    { width: imageWidth },
  );
  doc.image(sheet.png, margin, margin + textBlock, { width: imageWidth, height: imageHeight });
  doc.end();
  await finished;
  return Buffer.concat(chunks);
}
