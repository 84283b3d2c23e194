import { AppError } from '../core/app-error';
import type { BlobStore } from './blob-store';

/** Render PNGs in the blob store, named by cache key (`renders/<key>.png`). */
export class RenderStore {
  constructor(private readonly blobs: BlobStore) {}

  private keyOf(key: string): string {
    if (!/^[0-9a-f]{64}$/.test(key)) throw new AppError(404, 'not_found', 'The render was not found.');
    return `renders/${key}.png`;
  }

  write(key: string, png: Buffer): Promise<void> {
    return this.blobs.put(this.keyOf(key), png);
  }

  exists(key: string): Promise<boolean> {
    return this.blobs.has(this.keyOf(key));
  }

  read(key: string): Promise<Buffer> {
    return this.blobs.get(this.keyOf(key));
  }

  remove(keys: string[]): Promise<void> {
    return this.blobs.remove(keys.map((k) => this.keyOf(k)));
  }

  /** Removes render files whose key `isKnown` does not list (after a crash); returns how many. */
  async reconcile(isKnown: (keys: string[]) => Promise<Set<string>>): Promise<number> {
    const keys = (await this.blobs.list('renders/'))
      .map((k) => k.slice('renders/'.length))
      .filter((n) => /^[0-9a-f]{64}\.png$/.test(n))
      .map((n) => n.slice(0, 64));
    const known = await isKnown(keys);
    const stale = keys.filter((k) => !known.has(k));
    await this.remove(stale);
    return stale.length;
  }
}
