import { execFileSync } from 'node:child_process';
import { blurKernels } from './glow/blur-kernels';
import { composeRows } from './output/compose-kernels';

test('the committed modules are their .wat sources compiled (npx tsx scripts/gen-wasm.ts)', () => {
  expect(() => execFileSync(process.execPath, ['--require', 'tsx/cjs', 'scripts/gen-wasm.ts', '--check'], { stdio: 'pipe' })).not.toThrow();
});

test('this Node.js runs the kernels (so the comparisons with the loops compare two things)', () => {
  expect(blurKernels()).not.toBeNull();
  const taps = { index: new Int32Array(8), weight: new Float32Array(8) };
  expect(
    composeRows({
      width: 4,
      cols: 2,
      glowWidth: 4,
      profiles: 2,
      glowRows: 2,
      xs: { ...taps, stride: 2 },
      gx: taps,
      table: new Int32Array(16),
      perV: 1,
      vMax: 2,
      zero: -1,
      top: -1,
      thresholds: new Float64Array(3 * 257),
    }),
  ).not.toBeNull();
});
