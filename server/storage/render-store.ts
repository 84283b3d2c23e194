import { randomBytes } from 'node:crypto';
import { access, mkdir, readdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import path from 'node:path';
import { AppError } from '../core/app-error';

/** Render PNGs on disk, named by cache key, outside the web root; written atomically. */
export class RenderStore {
  constructor(private readonly dir: string) {}

  fileOf(key: string): string {
    if (!/^[0-9a-f]{64}$/.test(key)) throw new AppError(404, 'not_found', 'The render was not found.');
    return path.join(this.dir, 'renders', `${key}.png`);
  }

  async write(key: string, png: Buffer): Promise<void> {
    const file = this.fileOf(key);
    await mkdir(path.dirname(file), { recursive: true });
    // A random suffix: two writers of one key in the same millisecond must not share a temp file.
    const tmp = `${file}.${randomBytes(8).toString('hex')}.tmp`;
    await writeFile(tmp, png);
    await rename(tmp, file);
  }

  async exists(key: string): Promise<boolean> {
    return access(this.fileOf(key)).then(
      () => true,
      () => false,
    );
  }

  read(key: string): Promise<Buffer> {
    return readFile(this.fileOf(key));
  }

  async remove(keys: string[]): Promise<void> {
    for (const key of keys) await rm(this.fileOf(key), { force: true });
  }

  /** Removes temp files and render files whose key `isKnown` does not list (after a crash); returns how many. */
  async reconcile(isKnown: (keys: string[]) => Promise<Set<string>>): Promise<number> {
    const dir = path.join(this.dir, 'renders');
    const names = await readdir(dir).catch(() => [] as string[]);
    const keys = names.filter((n) => /^[0-9a-f]{64}\.png$/.test(n)).map((n) => n.slice(0, 64));
    const known = await isKnown(keys);
    const stale = names.filter((n) => n.endsWith('.tmp') || (/^[0-9a-f]{64}\.png$/.test(n) && !known.has(n.slice(0, 64))));
    for (const n of stale) await rm(path.join(dir, n), { force: true });
    return stale.length;
  }
}
