import { queueOptionsSymbol } from 'piscina';
import { RenderTaskQueue, withOrder, type TaskOrder } from './task-queue';

/** A stand-in for piscina's task record: the payload's order under the queue-options symbol. */
const task = (label: string, order?: TaskOrder) => ({ label, [queueOptionsSymbol]: order ?? null });
const drain = (q: RenderTaskQueue) => {
  const out: string[] = [];
  for (let t = q.shift(); t; t = q.shift()) out.push((t as unknown as { label: string }).label);
  return out;
};

describe('the render pool queue [def]', () => {
  test('interactive work first, earlier work first within each class, arrival order within a piece of work', () => {
    const q = new RenderTaskQueue();
    q.push(task('export 1, band a', { background: true, work: 1 }));
    q.push(task('render 3, band a', { background: false, work: 3 }));
    q.push(task('export 1, band b', { background: true, work: 1 }));
    q.push(task('render 2, band a', { background: false, work: 2 }));
    q.push(task('export 0', { background: true, work: 0 }));
    q.push(task('render 3, band b', { background: false, work: 3 }));
    q.push(task('render 2, band b', { background: false, work: 2 }));
    expect(q.size).toBe(7);
    expect(drain(q)).toEqual([
      'render 2, band a',
      'render 2, band b',
      'render 3, band a',
      'render 3, band b',
      'export 0',
      'export 1, band a',
      'export 1, band b',
    ]);
    expect(q.size).toBe(0);
    expect(q.shift()).toBeNull();
  });

  test('a task without an order is interactive work of its own, after the work already numbered', () => {
    const q = new RenderTaskQueue();
    q.push(task('unordered'));
    q.push(task('export', { background: true, work: 0 }));
    q.push(task('render', { background: false, work: 5 }));
    expect(drain(q)).toEqual(['render', 'unordered', 'export']);
  });

  test('remove takes out the task it is given (an aborted task) and leaves the order of the rest', () => {
    const q = new RenderTaskQueue();
    const tasks = [0, 1, 2].map((i) => task(`render ${i}`, { background: false, work: i }));
    tasks.forEach((t) => q.push(t));
    q.remove(tasks[1]);
    q.remove(task('never queued'));
    expect(drain(q)).toEqual(['render 0', 'render 2']);
  });

  test('withOrder puts the order where the queue reads it, under a symbol a worker never receives', () => {
    const payload = withOrder({ rows: 3 }, { background: true, work: 9 });
    expect((payload as Record<symbol, unknown>)[queueOptionsSymbol]).toEqual({ background: true, work: 9 });
    expect(structuredClone(payload)).toEqual({ rows: 3 });
    expect(Object.getOwnPropertySymbols(structuredClone(payload))).toEqual([]);
  });
});
