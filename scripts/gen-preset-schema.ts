// Writes shared/model/preset-document.schema.json (JSON Schema of the preset document format)
// from the shared zod schema. presets.spec.ts fails when the committed file is out of date.
import { writeFileSync } from 'node:fs';
import { presetDocumentJsonSchema } from '@shared/api/preset-json-schema';

writeFileSync('shared/model/preset-document.schema.json', `${JSON.stringify(presetDocumentJsonSchema(), null, 2)}\n`);
console.log('wrote shared/model/preset-document.schema.json');
