// Runs one exported async function of a TypeScript module in a worker thread, through tsx's
// CommonJS hook as the render pool's workers do: heavy numeric test fixtures run there at
// Node's full speed (jest's module sandbox slows typed-array loops several times over).
const { parentPort, workerData } = require('node:worker_threads');
require('tsx/cjs/api').register();
const { modulePath, exportName, args } = workerData;
Promise.resolve()
  .then(() => require(modulePath)[exportName](...args))
  .then((value) => parentPort.postMessage({ ok: true, value }))
  .catch((err) => parentPort.postMessage({ ok: false, name: err.name, message: err.message }));
