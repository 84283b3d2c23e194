import path from 'node:path';
import { Worker } from 'node:worker_threads';

/** An error thrown in the worker, by name and message (classes do not cross threads). */
export class WorkerError extends Error {
  constructor(
    readonly errorName: string,
    message: string,
  ) {
    super(message);
  }
}

/** Calls `exportName(...args)` of a TypeScript module in a worker thread and answers its (structured-cloned) result. */
export function inWorker<T>(modulePath: string, exportName: string, ...args: unknown[]): Promise<T> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(path.join(__dirname, 'worker-entry.cjs'), { workerData: { modulePath, exportName, args } });
    worker.once('message', (m: { ok: boolean; value?: T; name?: string; message?: string }) => {
      void worker.terminate();
      if (m.ok) resolve(m.value as T);
      else reject(new WorkerError(m.name ?? 'Error', m.message ?? ''));
    });
    worker.once('error', reject);
  });
}
