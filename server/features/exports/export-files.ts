import type { ExportFormat, ExportKind } from '@shared/api/export.schema';
import { PRESET_FORMAT } from '@shared/api/preset.schema';
import type { LookSpec } from './export.model';

/** The files an export leaves, by format: the stored name, the content type, what people read. */
export const EXPORT_FILES: Readonly<Record<ExportFormat, { name: string; type: string; label: string; extension: string }>> = {
  png: { name: 'sheet.png', type: 'image/png', label: 'Sheet (PNG)', extension: 'png' },
  pdf: { name: 'sheet.pdf', type: 'application/pdf', label: 'Sheet (PDF)', extension: 'pdf' },
  zip: { name: 'renders.zip', type: 'application/zip', label: 'Single renders and manifest (ZIP)', extension: 'zip' },
  apng: { name: 'animation.png', type: 'image/apng', label: 'Animation (APNG, every colour kept)', extension: 'png' },
  gif: { name: 'animation.gif', type: 'image/gif', label: 'Animation (GIF, 256 colours a frame)', extension: 'gif' },
  json: { name: 'manifest.json', type: 'application/json', label: 'Manifest with the flash check (JSON)', extension: 'json' },
};

/** Which files each kind of export makes, in the order they are offered. */
export const FORMATS_OF: Readonly<Record<ExportKind, readonly ExportFormat[]>> = {
  sheet: ['png', 'pdf', 'zip'],
  animation: ['apng', 'gif', 'json'],
};

/** A look as manifests state it: which it was, and its parameters as a preset document (the format preset import reads). */
export function lookManifest(look: LookSpec) {
  return {
    id: look.id,
    revision: look.revision,
    panelTypeName: look.panelTypeName,
    preset: { format: PRESET_FORMAT, version: 1 as const, name: look.name, panelTypeId: look.panelTypeId, parameters: look.parameters },
  };
}
