import { ReadCache } from './read-cache';
import { sessionCache } from './session';

test('a read cache answers a burst with one load, and loads again after its time or a clear', async () => {
  let loads = 0;
  const cache = new ReadCache<number>('test', 50);
  const load = async () => ++loads;
  expect(await Promise.all([cache.read('k', load), cache.read('k', load), cache.read('k', load)])).toEqual([1, 1, 1]);
  expect(await cache.read('k', load)).toBe(1);
  cache.clear();
  expect(await cache.read('k', load)).toBe(2);
  await new Promise((r) => setTimeout(r, 60));
  expect(await cache.read('k', load)).toBe(3);
  // A failed load is not kept; the next read tries again.
  await expect(cache.read('e', async () => Promise.reject(new Error('database away')))).rejects.toThrow('database away');
  expect(await cache.read('e', load)).toBe(4);
});

test('a read that started before a clear is not kept: it may hold what the write replaced', async () => {
  const cache = new ReadCache<string>('test', 60_000);
  let release!: (v: string) => void;
  const slow = cache.read('k', () => new Promise<string>((r) => (release = r)));
  cache.clear();
  // Nor is it shared with a read that starts after the clear.
  const fresh = cache.read('k', async () => 'after the write');
  release('before the write');
  expect(await slow).toBe('before the write');
  expect(await fresh).toBe('after the write');
  expect(await cache.read('k', async () => 'after the write')).toBe('after the write');
});

test('a read cache keeps within its count and size bounds, oldest out first', async () => {
  const cache = new ReadCache<Buffer>('test', 60_000, { maxEntries: 3, maxSize: 10, sizeOf: (b) => b.length });
  const loads: string[] = [];
  const read = (k: string, size: number) => cache.read(k, async () => (loads.push(k), Buffer.alloc(size)));
  await read('a', 4);
  await read('b', 4);
  await read('c', 4); // 12 > 10: a goes
  await read('b', 4);
  await read('a', 4); // loaded again; b goes
  await read('big', 11); // larger than the whole cache: served, never kept
  await read('big', 11);
  expect(loads).toEqual(['a', 'b', 'c', 'a', 'big', 'big']);
});

test('the session cache never serves a session past its stored expiry, and forgets an account at once', () => {
  const sess = (userId: string, expiresInMs: number) =>
    ({ cookie: { expires: new Date(Date.now() + expiresInMs), originalMaxAge: expiresInMs }, passport: { user: { id: userId } } }) as never;
  sessionCache.write('s1', sess('u1', 60_000), Date.now() + 60_000);
  sessionCache.write('s2', sess('u1', 60_000), Date.now() + 60_000);
  sessionCache.write('s3', sess('u2', 60_000), Date.now() + 60_000);
  sessionCache.write('s4', sess('u2', -1), Date.now() - 1);
  expect(sessionCache.read('s1')).toMatchObject({ passport: { user: { id: 'u1' } } });
  // Each read is a copy: express-session rewrites the object it gets.
  expect(sessionCache.read('s1')).not.toBe(sessionCache.read('s1'));
  expect(sessionCache.read('s4')).toBeUndefined();
  sessionCache.forgetUser('u1', 's2');
  expect(sessionCache.read('s1')).toBeUndefined();
  expect(sessionCache.read('s2')).toBeDefined();
  expect(sessionCache.read('s3')).toBeDefined();
});
