import { queueOptionsSymbol, type TaskQueue } from 'piscina';

type Task = Parameters<TaskQueue['push']>[0];

/** What a pool task tells the queue: whether a person is waiting on it, and which render it is part of. */
export interface TaskOrder {
  /** Work nobody watches as it happens (an export): it waits while interactive work is queued. */
  background: boolean;
  /** The render (or other piece of work) the task belongs to, numbered as the engine takes them. */
  work: number;
}

/** Sets a task payload's order, where the pool's queue reads it (the key is a symbol: a worker never sees it). */
export function withOrder<T extends object>(task: T, order: TaskOrder): T {
  return Object.assign(task, { [queueOptionsSymbol]: order });
}

interface Entry {
  task: Task;
  background: boolean;
  work: number;
  arrival: number;
}

/** Whether entry a goes before entry b: interactive first, then earlier work, then earlier arrival. */
const before = (a: Entry, b: Entry) =>
  a.background !== b.background ? !a.background : a.work !== b.work ? a.work < b.work : a.arrival < b.arrival;

/**
 * The render pool's queue (piscina's is first in, first out). Interactive work — a person waiting
 * on a page — goes before background work (exports), and within each, the tasks of work taken
 * earlier go first: a render already under way finishes before later ones take the threads,
 * where a FIFO queue interleaves every render's steps and all of them finish late. A task with
 * no order counts as interactive work of its own, taken when it arrives. The queue holds a few
 * tasks per render in hand (the engine bounds those), so a sorted array does.
 */
export class RenderTaskQueue implements TaskQueue {
  private readonly entries: Entry[] = [];
  private arrivals = 0;
  /** Work numbers for tasks that come without an order, after any the engine has given. */
  private unordered = Number.MAX_SAFE_INTEGER / 2;

  get size(): number {
    return this.entries.length;
  }

  push(task: Task): void {
    const order = task[queueOptionsSymbol] as TaskOrder | null;
    const entry: Entry = {
      task,
      background: order?.background ?? false,
      work: order?.work ?? this.unordered++,
      arrival: this.arrivals++,
    };
    let i = this.entries.length;
    while (i > 0 && before(entry, this.entries[i - 1])) i--;
    this.entries.splice(i, 0, entry);
  }

  shift(): Task | null {
    return this.entries.shift()?.task ?? null;
  }

  remove(task: Task): void {
    const i = this.entries.findIndex((e) => e.task === task);
    if (i >= 0) this.entries.splice(i, 1);
  }
}
