/** A file size for people: bytes below 1 KiB, then KiB and MiB with one decimal below 10 (binary units). */
export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} ${bytes === 1 ? 'byte' : 'bytes'}`;
  const [value, unit] = bytes < 1024 * 1024 ? [bytes / 1024, 'KiB'] : [bytes / 1024 / 1024, 'MiB'];
  return `${value < 10 ? value.toFixed(1) : Math.round(value)} ${unit}`;
}
