import { mkdir, readdir, readFile, rename, rm, writeFile, access } from 'node:fs/promises';
import path from 'node:path';
import { randomBytes } from 'node:crypto';

/**
 * Files outside the web root under generated names (ids and fixed names only, never a name a
 * user gave). Writes are atomic (temp file, then rename).
 */
export class FileStore {
  constructor(private readonly root: string) {}

  private file(folder: string, id: string, name: string): string {
    if (!/^[0-9a-f-]{36}$/.test(id) || !/^[a-z0-9.-]+$/.test(name)) throw new Error('bad storage key');
    return path.join(this.root, folder, id, name);
  }

  async write(folder: string, id: string, name: string, bytes: Buffer): Promise<void> {
    const target = this.file(folder, id, name);
    await mkdir(path.dirname(target), { recursive: true });
    const tmp = `${target}.${randomBytes(8).toString('hex')}.tmp`;
    await writeFile(tmp, bytes);
    await rename(tmp, target);
  }

  read(folder: string, id: string, name: string): Promise<Buffer> {
    return readFile(this.file(folder, id, name));
  }

  async exists(folder: string, id: string, name: string): Promise<boolean> {
    return access(this.file(folder, id, name)).then(
      () => true,
      () => false,
    );
  }

  async remove(folder: string, id: string): Promise<void> {
    if (!/^[0-9a-f-]{36}$/.test(id)) throw new Error('bad storage key');
    await rm(path.join(this.root, folder, id), { recursive: true, force: true });
  }

  /** Ids that have a folder (for reconciling storage with the database). */
  async ids(folder: string): Promise<string[]> {
    return readdir(path.join(this.root, folder)).catch(() => []);
  }
}
