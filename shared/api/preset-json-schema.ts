import { z } from 'zod';
import { presetDocumentSchema } from './preset.schema';

/** JSON Schema (2020-12) of the Emberline preset document, generated from the shared zod schema. */
export function presetDocumentJsonSchema(): Record<string, unknown> {
  return {
    $id: 'https://emberline.example/schemas/preset-document.schema.json',
    title: 'Emberline preset document',
    description: 'A panel look exported from Emberline: the panel type and every parameter in physical units.',
    ...z.toJSONSchema(presetDocumentSchema, { unrepresentable: 'any' }),
  };
}
