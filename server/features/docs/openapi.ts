import { z } from 'zod';
import type { RouteSpec, UploadSpec } from '../../core/api-router';
import type { Policy } from '../../core/policy';

const describePolicy = (p: Policy): string =>
  p.kind === 'public' ? 'No sign-in needed.' : p.kind === 'signedIn' ? 'Signed-in users.' : `Studio members with role ${p.role} or higher.`;

type JsonSchema = { properties?: Record<string, object>; required?: string[] } & Record<string, unknown>;

/** A request schema as JSON Schema, as the client writes it (before defaults and transforms). */
const inputSchema = (schema: z.ZodType): JsonSchema => z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as JsonSchema;

/** One OpenAPI query parameter per property of the route's query schema. */
function queryParameters(schema: z.ZodType): object[] {
  const json = inputSchema(schema);
  return Object.entries(json.properties ?? {}).map(([name, property]) => ({
    name,
    in: 'query',
    required: json.required?.includes(name) ?? false,
    schema: property,
  }));
}

/** A multipart body: the file in the field "file", beside the route's text fields. */
function multipartSchema(upload: UploadSpec): JsonSchema {
  const fields = inputSchema(upload.fields);
  return {
    ...fields,
    properties: {
      file: { type: 'string', format: 'binary', description: `${upload.file[0].toUpperCase()}${upload.file.slice(1)}` },
      ...fields.properties,
    },
    required: ['file', ...(fields.required ?? [])],
  };
}

/** Builds an OpenAPI 3.1 document from the registered routes: the same specs the server enforces. */
export function openApiDocument(specs: RouteSpec[]): object {
  const paths: Record<string, Record<string, object>> = {};
  for (const spec of specs) {
    const path = spec.path.replace(/:([A-Za-z]+)/g, '{$1}');
    const parameters: object[] = [...spec.path.matchAll(/:([A-Za-z]+)/g)].map((m) => ({
      name: m[1],
      in: 'path',
      required: true,
      schema: { type: 'string' },
    }));
    if (spec.query) parameters.push(...queryParameters(spec.query));
    const ok = String(spec.status ?? 200);
    paths[path] ??= {};
    paths[path][spec.method] = {
      tags: [spec.tag],
      summary: spec.summary,
      description: describePolicy(spec.policy),
      ...(parameters.length ? { parameters } : {}),
      ...(spec.body ? { requestBody: { required: true, content: { 'application/json': { schema: inputSchema(spec.body) } } } } : {}),
      ...(spec.upload
        ? { requestBody: { required: true, content: { 'multipart/form-data': { schema: multipartSchema(spec.upload) } } } }
        : {}),
      ...(spec.policy.kind === 'public' ? { security: [] } : {}),
      responses: {
        [ok]: { description: 'Success' },
        default: { description: 'Error', content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } },
      },
    };
  }
  return {
    openapi: '3.1.0',
    info: { title: 'Emberline API', version: '1', description: 'Mutations need the X-XSRF-TOKEN header echoing the XSRF-TOKEN cookie.' },
    paths,
    components: {
      securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'emberline.sid' } },
      schemas: {
        Error: {
          type: 'object',
          required: ['error'],
          properties: {
            error: {
              type: 'object',
              required: ['code', 'message'],
              properties: { code: { type: 'string' }, message: { type: 'string' }, details: {} },
            },
          },
        },
      },
    },
    security: [{ session: [] }],
  };
}
