import { createHarness, TestClient, type Harness } from '../../testing/harness';

// The route table is the one source of the API's shape: the OpenAPI document shows each route's
// query and multipart fields from the same schemas that parse them, and a bad value is a 400
// that names the field.

let h: Harness;
let owner: TestClient;
let studioId: string;
beforeAll(async () => {
  h = await createHarness();
  owner = new TestClient(h.app);
  await owner.signUp();
  studioId = (await owner.post('/api/studios', { name: 'Route Shapes' })).body.studio.id;
});
afterAll(() => h.close());

type Operation = {
  parameters?: { name: string; in: string; required: boolean; schema: { enum?: string[]; maximum?: number } }[];
  requestBody?: { content: Record<string, { schema: { properties: Record<string, { format?: string }>; required: string[] } }> };
};
const operation = async (path: string, method: string): Promise<Operation> => (await owner.get('/api/docs')).body.paths[path][method];

test('the document lists query parameters from the route schemas, with their options and limits', async () => {
  const list = await operation('/api/studios/{studioId}/presets', 'get');
  const query = Object.fromEntries((list.parameters ?? []).filter((p) => p.in === 'query').map((p) => [p.name, p]));
  expect(Object.keys(query).sort()).toEqual(['page', 'pageSize', 'panelTypeId', 'q', 'sort']);
  expect(query.sort.schema.enum).toEqual(['name', '-name', 'updated', '-updated']);
  expect(query.pageSize.schema.maximum).toBe(100);
  expect(query.sort.required).toBe(false);
  const pattern = await operation('/api/studios/{studioId}/matches/pattern', 'get');
  expect(pattern.parameters?.find((p) => p.name === 'look')).toMatchObject({ in: 'query', required: true });
});

test('an upload route is documented as multipart with a binary file beside its text fields', async () => {
  const upload = await operation('/api/studios/{studioId}/artworks', 'post');
  const form = upload.requestBody?.content['multipart/form-data'].schema;
  expect(form?.properties.file.format).toBe('binary');
  expect(Object.keys(form?.properties ?? {})).toEqual(expect.arrayContaining(['name', 'frameWidth', 'frameHeight', 'frameDelayMs']));
  expect(form?.required).toContain('file');
  expect(upload.requestBody?.content['application/json']).toBeUndefined();
});

test('a bad query value is refused with the field and what it takes', async () => {
  const base = `/api/studios/${studioId}`;
  const tooMany = await owner.get(`${base}/presets?pageSize=1000`);
  expect(tooMany.status).toBe(400);
  expect(tooMany.body.error.message).toBe('The query string is not valid: pageSize: pageSize must be a whole number from 1 to 100');
  const sort = await owner.get(`${base}/artworks?sort=sideways`);
  expect(sort.status).toBe(400);
  expect(sort.body.error.message).toMatch(/sort must be one of newest, oldest, name, got “sideways”/);
  const twice = await owner.get(`${base}/activity?limit=5&limit=6`);
  expect(twice.status).toBe(400);
  expect(twice.body.error.details.issues[0].path).toBe('limit');
  // A key no route reads (a cache-buster) is dropped, not refused.
  expect((await owner.get(`${base}/activity?limit=5&t=123`)).status).toBe(200);
});

test('an upload without its file names the field to attach it to', async () => {
  const res = await owner.post(`/api/studios/${studioId}/roms`, {});
  expect(res.status).toBe(400);
  expect(res.body.error.message).toBe('Attach the ROM image as the multipart field "file".');
});
