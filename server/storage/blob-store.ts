import {
  DeleteObjectsCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  NoSuchKey,
  NotFound,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { randomBytes } from 'node:crypto';
import { access, mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Config } from '../config';

/** How a download link names and types the file it serves. */
export interface DownloadAs {
  fileName: string;
  contentType: string;
}

/**
 * Where the app keeps its files — artworks, renders, exports — by key ("exports/<id>/sheet.png").
 * Keys are made by the app from ids and fixed names, never from what a user typed. A put is atomic:
 * a reader sees the old bytes or the new, whole. One interface over a local folder and an
 * S3-compatible bucket, so processes on other machines can share the files.
 */
export interface BlobStore {
  put(key: string, bytes: Buffer): Promise<void>;
  /** The bytes; a missing key rejects with BlobNotFound. */
  get(key: string): Promise<Buffer>;
  has(key: string): Promise<boolean>;
  remove(keys: string[]): Promise<void>;
  /** Removes every key that starts with `prefix` (which ends in "/"). */
  removePrefix(prefix: string): Promise<void>;
  /** Every key that starts with `prefix`. */
  list(prefix: string): Promise<string[]>;
  /**
   * A link that downloads the blob without a session until it expires, when the store can make
   * one itself (a bucket's presigned URL); null when the app must sign and serve it.
   */
  presignedUrl(key: string, seconds: number, as: DownloadAs): Promise<string | null>;
}

export class BlobNotFound extends Error {
  constructor(readonly key: string) {
    super(`no blob at ${key}`);
    this.name = 'BlobNotFound';
  }
}

// The pinned SDK supports Node 20, which Emberline runs on; its notice about later SDK versions is not for our logs.
process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= 'true';

const KEY = /^[a-z0-9][a-z0-9._-]*(\/[a-z0-9][a-z0-9._-]*)*$/i;
const PREFIX = /^([a-z0-9][a-z0-9._-]*\/)+$/i;
function checked(key: string, pattern = KEY): string {
  if (!pattern.test(key) || key.split('/').some((part) => part === '..' || part === '.'))
    throw new Error(`bad storage key "${key.slice(0, 80)}"`);
  return key;
}

/** Blobs as files in a folder outside the web root; writes go to a temp file, then rename. */
export class DiskBlobStore implements BlobStore {
  constructor(readonly root: string) {}

  private file(key: string): string {
    return path.join(this.root, ...checked(key).split('/'));
  }

  async put(key: string, bytes: Buffer): Promise<void> {
    const target = this.file(key);
    await mkdir(path.dirname(target), { recursive: true });
    // A random suffix: two writers of one key in the same millisecond must not share a temp file.
    const tmp = `${target}.${randomBytes(8).toString('hex')}.tmp`;
    await writeFile(tmp, bytes);
    await rename(tmp, target);
  }

  get(key: string): Promise<Buffer> {
    return readFile(this.file(key)).catch((err: NodeJS.ErrnoException) => {
      throw err.code === 'ENOENT' ? new BlobNotFound(key) : err;
    });
  }

  has(key: string): Promise<boolean> {
    return access(this.file(key)).then(
      () => true,
      () => false,
    );
  }

  async remove(keys: string[]): Promise<void> {
    for (const key of keys) await rm(this.file(key), { force: true });
  }

  async removePrefix(prefix: string): Promise<void> {
    await rm(path.join(this.root, ...checked(prefix, PREFIX).split('/')), { recursive: true, force: true });
  }

  async list(prefix: string): Promise<string[]> {
    const dir = path.join(this.root, ...checked(prefix, PREFIX).split('/'));
    const entries = await readdir(dir, { recursive: true, withFileTypes: true }).catch(() => []);
    return entries
      .filter((e) => e.isFile() && !e.name.endsWith('.tmp'))
      .map((e) => `${prefix}${path.relative(dir, path.join(e.parentPath, e.name)).split(path.sep).join('/')}`);
  }

  async presignedUrl(): Promise<null> {
    return null;
  }

  /** Removes temp files left by writes that a crash interrupted; answers how many. */
  async sweepTemp(): Promise<number> {
    const entries = await readdir(this.root, { recursive: true, withFileTypes: true }).catch(() => []);
    const temps = entries.filter((e) => e.isFile() && e.name.endsWith('.tmp'));
    for (const e of temps) await rm(path.join(e.parentPath, e.name), { force: true });
    return temps.length;
  }
}

export interface S3Options {
  bucket: string;
  /** An S3-compatible endpoint; absent for the provider's own. */
  endpoint?: string;
  region: string;
  /** Bucket in the path, not the host name (what most S3-compatible servers want). */
  forcePathStyle: boolean;
  /** Given for a local fake; otherwise the SDK's usual chain (AWS_ACCESS_KEY_ID …, profiles, roles). */
  credentials?: { accessKeyId: string; secretAccessKey: string };
}

/** Blobs as objects in an S3-compatible bucket (the bucket must exist). */
export class S3BlobStore implements BlobStore {
  private readonly s3: S3Client;
  private readonly bucket: string;

  constructor(options: S3Options) {
    this.bucket = options.bucket;
    this.s3 = new S3Client({
      region: options.region,
      endpoint: options.endpoint,
      forcePathStyle: options.forcePathStyle,
      credentials: options.credentials,
    });
  }

  async put(key: string, bytes: Buffer): Promise<void> {
    await this.s3.send(new PutObjectCommand({ Bucket: this.bucket, Key: checked(key), Body: bytes }));
  }

  async get(key: string): Promise<Buffer> {
    try {
      const res = await this.s3.send(new GetObjectCommand({ Bucket: this.bucket, Key: checked(key) }));
      return Buffer.from(await res.Body!.transformToByteArray());
    } catch (err) {
      if (err instanceof NoSuchKey || (err as { name?: string }).name === 'NoSuchKey') throw new BlobNotFound(key);
      throw err;
    }
  }

  async has(key: string): Promise<boolean> {
    try {
      await this.s3.send(new HeadObjectCommand({ Bucket: this.bucket, Key: checked(key) }));
      return true;
    } catch (err) {
      if (err instanceof NotFound || (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return false;
      throw err;
    }
  }

  async remove(keys: string[]): Promise<void> {
    // DeleteObjects takes at most 1000 keys a call.
    for (let i = 0; i < keys.length; i += 1000) {
      const batch = keys.slice(i, i + 1000).map((Key) => ({ Key: checked(Key) }));
      if (batch.length) await this.s3.send(new DeleteObjectsCommand({ Bucket: this.bucket, Delete: { Objects: batch, Quiet: true } }));
    }
  }

  async removePrefix(prefix: string): Promise<void> {
    await this.remove(await this.list(prefix));
  }

  async list(prefix: string): Promise<string[]> {
    checked(prefix, PREFIX);
    const keys: string[] = [];
    let token: string | undefined;
    do {
      const page = await this.s3.send(new ListObjectsV2Command({ Bucket: this.bucket, Prefix: prefix, ContinuationToken: token }));
      keys.push(...(page.Contents ?? []).map((o) => o.Key!));
      token = page.IsTruncated ? page.NextContinuationToken : undefined;
    } while (token);
    return keys;
  }

  presignedUrl(key: string, seconds: number, as: DownloadAs): Promise<string> {
    const disposition = `attachment; filename="${as.fileName.replace(/[^\w .-]/g, '_')}"`;
    return getSignedUrl(
      this.s3,
      new GetObjectCommand({
        Bucket: this.bucket,
        Key: checked(key),
        ResponseContentDisposition: disposition,
        ResponseContentType: as.contentType,
      }),
      { expiresIn: seconds },
    );
  }
}

/** The store the configuration asks for: the storage folder, or a bucket (STORAGE=s3). */
export function createBlobStore(config: Pick<Config, 'storage' | 'storageDir'>): BlobStore {
  return config.storage.kind === 's3' ? new S3BlobStore(config.storage) : new DiskBlobStore(config.storageDir);
}
