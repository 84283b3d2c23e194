import type { BlobStore } from './blob-store';

/**
 * Files of a record under generated names: `<folder>/<id>/<name>` in the blob store (ids and fixed
 * names only, never a name a user gave).
 */
export class FileStore {
  constructor(readonly blobs: BlobStore) {}

  key(folder: string, id: string, name: string): string {
    if (!/^[0-9a-f-]{36}$/.test(id) || !/^[a-z0-9.-]+$/.test(name)) throw new Error('bad storage key');
    return `${folder}/${id}/${name}`;
  }

  write(folder: string, id: string, name: string, bytes: Buffer): Promise<void> {
    return this.blobs.put(this.key(folder, id, name), bytes);
  }

  read(folder: string, id: string, name: string): Promise<Buffer> {
    return this.blobs.get(this.key(folder, id, name));
  }

  exists(folder: string, id: string, name: string): Promise<boolean> {
    return this.blobs.has(this.key(folder, id, name));
  }

  async remove(folder: string, id: string): Promise<void> {
    if (!/^[0-9a-f-]{36}$/.test(id)) throw new Error('bad storage key');
    await this.blobs.removePrefix(`${folder}/${id}/`);
  }

  /** Ids that have files (for reconciling storage with the database). */
  async ids(folder: string): Promise<string[]> {
    return [...new Set((await this.blobs.list(`${folder}/`)).map((key) => key.split('/')[1]))];
  }
}
