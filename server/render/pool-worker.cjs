// Entry point of a render-pool worker thread: TypeScript through tsx's CommonJS hook, then the tasks.
// On Linux a thread has its own nice value: renders yield the cores to the HTTP thread and
// PostgreSQL whenever those have work, so reads stay fast while long renders run.
try {
  require('node:os').setPriority(Number(process.env.RENDER_NICE ?? 10));
} catch {
  // Not permitted or not supported: renders run at normal priority.
}
require('tsx/cjs/api').register();
module.exports = require('./pool-tasks.ts');
