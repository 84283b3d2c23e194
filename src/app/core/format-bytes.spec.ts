import { formatBytes } from './format-bytes';

// Issue "Workflow", item 16: a small GIF showed "0 KiB". Binary units per IEC 80000-13 [std].
describe('formatBytes', () => {
  test.each([
    [0, '0 bytes'],
    [1, '1 byte'],
    [300, '300 bytes'],
    [1023, '1023 bytes'],
    [1024, '1.0 KiB'],
    [1536, '1.5 KiB'],
    [20 * 1024, '20 KiB'],
    [1024 * 1024, '1.0 MiB'],
    [25 * 1024 * 1024, '25 MiB'],
  ])('%i → %s', (bytes, text) => {
    expect(formatBytes(bytes)).toBe(text);
  });
});
