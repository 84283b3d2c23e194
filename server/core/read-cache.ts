import type { Transaction } from 'sequelize';

type WriteOptions = { transaction?: Transaction | null } | undefined;
/** The part of a Sequelize model class the cache hooks into. */
type Hookable = { addHook(hook: string, name: string, fn: (...args: unknown[]) => void): void };

const WRITE_HOOKS = [
  'afterCreate',
  'afterBulkCreate',
  'afterUpdate',
  'afterBulkUpdate',
  'afterDestroy',
  'afterBulkDestroy',
  'afterUpsert',
] as const;

/**
 * Answers to hot reads (a member's role, a studio's library) kept in memory for a few seconds, so
 * a burst of requests asks PostgreSQL once (concurrent misses share one load). Every write through Sequelize to a watched model
 * empties the cache at once, and again when the write's transaction commits (a read between the
 * write and its commit still sees the old row); a read that started before an emptying is not
 * kept. So a change made through the app holds from the next request on, and `ttlMs` bounds what
 * a change from outside the app (psql, another process) can miss. Values are shared between
 * callers: they must not be changed.
 */
export class ReadCache<V> {
  private readonly entries = new Map<string, { value: V; until: number; size: number }>();
  /** Loads under way: concurrent misses on one key share one load. */
  private readonly loading = new Map<string, { generation: number; promise: Promise<V> }>();
  private generation = 0;
  private total = 0;

  /** `sizeOf` and `maxSize` bound the cache by a measure of the values (bytes) as well as by count. */
  constructor(
    readonly name: string,
    private readonly ttlMs: number,
    private readonly limits: { maxEntries: number; maxSize?: number; sizeOf?: (value: V) => number } = { maxEntries: 10_000 },
  ) {}

  async read(key: string, load: () => Promise<V>): Promise<V> {
    const now = Date.now();
    const hit = this.entries.get(key);
    if (hit && hit.until > now) return hit.value;
    if (hit) this.drop(key);
    const pending = this.loading.get(key);
    if (pending && pending.generation === this.generation) return pending.promise;
    const generation = this.generation;
    const promise = load().then((value) => {
      if (generation === this.generation) this.keep(key, value, now);
      return value;
    });
    this.loading.set(key, { generation, promise });
    try {
      return await promise;
    } finally {
      if (this.loading.get(key)?.promise === promise) this.loading.delete(key);
    }
  }

  clear(): void {
    this.generation++;
    this.entries.clear();
    this.total = 0;
  }

  /** Empties the cache on every write to these models. Call after the models are initialised. */
  watch(...models: unknown[]): void {
    for (const model of models as Hookable[]) {
      for (const hook of WRITE_HOOKS) {
        model.addHook(hook, `read-cache-${this.name}-${hook}`, (...args) => {
          // Bulk update and destroy hooks get the options first; the others get them second.
          const options = (hook === 'afterBulkUpdate' || hook === 'afterBulkDestroy' ? args[0] : args[1]) as WriteOptions;
          this.clear();
          options?.transaction?.afterCommit(() => this.clear());
        });
      }
    }
  }

  private keep(key: string, value: V, now: number): void {
    const size = this.limits.sizeOf?.(value) ?? 0;
    if (this.limits.maxSize !== undefined && size > this.limits.maxSize) return;
    this.drop(key);
    this.entries.set(key, { value, until: now + this.ttlMs, size });
    this.total += size;
    // Oldest first in a Map.
    while (this.entries.size > this.limits.maxEntries || (this.limits.maxSize !== undefined && this.total > this.limits.maxSize)) {
      this.drop(this.entries.keys().next().value!);
    }
  }

  private drop(key: string): void {
    const e = this.entries.get(key);
    if (!e) return;
    this.total -= e.size;
    this.entries.delete(key);
  }
}
