import { CreateBucketCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import sharp from 'sharp';
import { QUEUES } from '../../jobs/job-queue';
import { createHarness, TestClient, type Harness } from '../../testing/harness';
import { pngOf } from '../../testing/images';
import type { ExportJob } from './exports.service';

/**
 * STORAGE=s3: artworks, renders and exports in an S3-compatible bucket — here s3rver, a fake S3
 * server from npm that this spec starts on loopback — through the AWS SDK with the credentials it
 * reads from the environment, as on a real deployment.
 */
let fake: S3rver;
let s3: S3Client;
let h: Harness;
let editor: TestClient;
let studioId: string;
let endpoint: string;
const BUCKET = 'emberline-exports-test';
const keys = async (prefix: string) =>
  ((await s3.send(new ListObjectsV2Command({ Bucket: BUCKET, Prefix: prefix }))).Contents ?? []).map((o) => o.Key!);

beforeAll(async () => {
  fake = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: mkdtempSync(path.join(os.tmpdir(), 'emberline-s3-')) });
  const { port } = await fake.run();
  endpoint = `http://127.0.0.1:${port}`;
  process.env.AWS_ACCESS_KEY_ID = 'S3RVER';
  process.env.AWS_SECRET_ACCESS_KEY = 'S3RVER';
  s3 = new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true });
  await s3.send(new CreateBucketCommand({ Bucket: BUCKET }));
  h = await createHarness({ storage: { kind: 's3', bucket: BUCKET, endpoint, region: 'us-east-1', forcePathStyle: true } });
  await h.jobs.work<ExportJob>(QUEUES.exports, (job) => h.app.exports.run(job));
  editor = new TestClient(h.app);
  await editor.signUp();
  studioId = (await editor.post('/api/studios', { name: 'Bucket studio' })).body.studio.id;
}, 60_000);
afterAll(async () => {
  await h.close();
  await fake.close();
});

test('artworks, renders and an export live in the bucket; the download is a presigned link to it; deleting removes the objects', async () => {
  const upload = await editor.upload(
    `/api/studios/${studioId}/artworks`,
    { name: 'Ramp' },
    { name: 'ramp.png', bytes: pngOf(32, 24, (x) => [x * 8, x * 8, x * 8, 255]) },
  );
  expect(upload.status).toBe(201);
  const artworkId = upload.body.artwork.id;
  expect((await keys(`artworks/${artworkId}/`)).sort()).toEqual([`artworks/${artworkId}/original`, `artworks/${artworkId}/thumbnail.png`]);
  const render = await editor.post(`/api/studios/${studioId}/renders`, { artworkId, presetId: 'vfd-bluegreen-256x64.standard', scale: 1 });
  expect(await keys(`renders/${render.body.render.key}`)).toHaveLength(1);

  const asked = await editor.post(`/api/studios/${studioId}/exports`, {
    layout: 'grid',
    artworkIds: [artworkId],
    looks: ['vfd-bluegreen-256x64.standard'],
    scale: 1,
  });
  expect(asked.status).toBe(202);
  const id = asked.body.export.id;
  for (let i = 0; i < 200 && (await editor.get(`/api/studios/${studioId}/exports/${id}`)).body.export.status !== 'done'; i++)
    await new Promise((r) => setTimeout(r, 150));
  expect((await keys(`exports/${id}/`)).sort()).toEqual([
    `exports/${id}/renders.zip`,
    `exports/${id}/sheet.pdf`,
    `exports/${id}/sheet.png`,
  ]);

  const res = await editor.get(`/api/studios/${studioId}/exports/${id}/file?format=png`);
  expect(res.status).toBe(303);
  const link = new URL(res.headers.location);
  expect(link.host).toBe(`127.0.0.1:${new URL(endpoint).port}`);
  expect(link.pathname).toBe(`/${BUCKET}/exports/${id}/sheet.png`);
  expect(link.searchParams.get('X-Amz-Expires')).toBe('900');
  const file = await fetch(link);
  expect(file.status).toBe(200);
  expect(file.headers.get('content-disposition')).toMatch(/^attachment; filename=".*\.png"$/);
  const meta = await sharp(Buffer.from(await file.arrayBuffer())).metadata();
  expect(meta.format).toBe('png');

  expect((await editor.delete(`/api/studios/${studioId}/exports/${id}`)).status).toBe(204);
  expect(await keys(`exports/${id}/`)).toEqual([]);
  expect((await editor.delete(`/api/studios/${studioId}/artworks/${artworkId}`)).status).toBe(204);
  expect(await keys(`artworks/${artworkId}/`)).toEqual([]);
  expect(await keys('renders/')).toEqual([]);
});
