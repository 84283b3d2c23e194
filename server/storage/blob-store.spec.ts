import { CreateBucketCommand, S3Client } from '@aws-sdk/client-s3';
import { mkdtempSync, readdirSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import S3rver from 's3rver';
import { BlobNotFound, DiskBlobStore, S3BlobStore, type BlobStore } from './blob-store';

/**
 * One contract for both stores: the local folder and an S3-compatible bucket, the latter against
 * s3rver (a fake S3 server from npm that this spec starts on loopback), through the AWS SDK.
 */
let fake: S3rver;
let endpoint: string;
const credentials = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };

beforeAll(async () => {
  fake = new S3rver({ port: 0, address: '127.0.0.1', silent: true, directory: mkdtempSync(path.join(os.tmpdir(), 'emberline-s3-')) });
  const { port } = await fake.run();
  endpoint = `http://127.0.0.1:${port}`;
  await new S3Client({ endpoint, region: 'us-east-1', forcePathStyle: true, credentials }).send(
    new CreateBucketCommand({ Bucket: 'emberline-test' }),
  );
});
afterAll(() => fake.close());

const stores: [string, () => BlobStore][] = [
  ['disk', () => new DiskBlobStore(mkdtempSync(path.join(os.tmpdir(), 'emberline-blobs-')))],
  [
    's3 (fake S3 server)',
    () => new S3BlobStore({ bucket: 'emberline-test', endpoint, region: 'us-east-1', forcePathStyle: true, credentials }),
  ],
];

describe.each(stores)('%s blob store', (_name, make) => {
  let store: BlobStore;
  const id = () => Math.random().toString(36).slice(2, 10);
  beforeAll(() => {
    store = make();
  });

  it('puts, gets, says what it has, lists by prefix and removes', async () => {
    const root = `exports/${id()}/`;
    await store.put(`${root}sheet.png`, Buffer.from('png bytes'));
    await store.put(`${root}sheet.pdf`, Buffer.from('pdf bytes'));
    await store.put(`${root}sub/manifest.json`, Buffer.from('{}'));
    expect((await store.get(`${root}sheet.png`)).toString()).toBe('png bytes');
    expect(await store.has(`${root}sheet.pdf`)).toBe(true);
    expect(await store.has(`${root}nothing`)).toBe(false);
    expect((await store.list(root)).sort()).toEqual([`${root}sheet.pdf`, `${root}sheet.png`, `${root}sub/manifest.json`]);
    await store.put(`${root}sheet.png`, Buffer.from('new bytes'));
    expect((await store.get(`${root}sheet.png`)).toString()).toBe('new bytes');
    await store.remove([`${root}sheet.pdf`]);
    expect(await store.has(`${root}sheet.pdf`)).toBe(false);
    await store.removePrefix(root);
    expect(await store.list(root)).toEqual([]);
  });

  it('answers a missing key with BlobNotFound', async () => {
    await expect(store.get(`renders/${id()}.png`)).rejects.toBeInstanceOf(BlobNotFound);
  });

  it('refuses keys that could leave its folder or bucket prefix', async () => {
    for (const key of ['../x', 'a/../../b', '/abs', 'a//b', 'a/./b', ''])
      await expect(store.put(key, Buffer.from('x'))).rejects.toThrow('bad storage key');
    await expect(store.list('../')).rejects.toThrow('bad storage key');
  });
});

test('a bucket presigns an expiring download link that names and types the file; a folder leaves signing to the app', async () => {
  const s3 = new S3BlobStore({ bucket: 'emberline-test', endpoint, region: 'us-east-1', forcePathStyle: true, credentials });
  await s3.put('exports/presign/sheet.png', Buffer.from('the sheet'));
  const url = (await s3.presignedUrl('exports/presign/sheet.png', 60, { fileName: 'Client sheet.png', contentType: 'image/png' }))!;
  expect(url).toMatch(/X-Amz-Expires=60/);
  const res = await fetch(url);
  expect(res.status).toBe(200);
  expect(res.headers.get('content-disposition')).toBe('attachment; filename="Client sheet.png"');
  expect(await res.text()).toBe('the sheet');
  // (The fake server does not check signatures as strictly as a real bucket: no tampering test here.)
  expect(await new DiskBlobStore(os.tmpdir()).presignedUrl()).toBeNull();
});

test('a folder store writes through temp files, and sweeps those a crash left', async () => {
  const root = mkdtempSync(path.join(os.tmpdir(), 'emberline-blobs-'));
  const disk = new DiskBlobStore(root);
  await disk.put('artworks/a/original', Buffer.from('x'));
  expect(readdirSync(path.join(root, 'artworks/a'))).toEqual(['original']);
  const { writeFileSync } = await import('node:fs');
  writeFileSync(path.join(root, 'artworks/a/original.0123.tmp'), 'half');
  expect(await disk.list('artworks/')).toEqual(['artworks/a/original']);
  expect(await disk.sweepTemp()).toBe(1);
  expect(readdirSync(path.join(root, 'artworks/a'))).toEqual(['original']);
});
