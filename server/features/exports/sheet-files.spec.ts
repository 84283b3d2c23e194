import { readFileSync } from 'node:fs';
import path from 'node:path';
import { woffToSfnt } from './sheet-files';

const FONTS = path.join(path.dirname(require.resolve('@fontsource/inter/package.json')), 'files');

/** An OpenType table checksum: the sum of its big-endian uint32 words, the last one padded with zeros [std: OpenType 1.9, "Calculating checksums"]. */
function checksum(table: Buffer): number {
  const padded = Buffer.concat([table, Buffer.alloc((4 - (table.length % 4)) % 4)]);
  let sum = 0;
  for (let i = 0; i < padded.length; i += 4) sum = (sum + padded.readUInt32BE(i)) >>> 0;
  return sum;
}

describe('WOFF 1.0 → sfnt [std: W3C WOFF File Format 1.0; OpenType 1.9 table directory]', () => {
  for (const file of ['inter-latin-400-normal.woff', 'inter-latin-600-normal.woff']) {
    it(`unpacks ${file} into a font whose every table matches the checksum its WOFF directory states`, () => {
      const woff = readFileSync(path.join(FONTS, file));
      const sfnt = woffToSfnt(woff);
      const numTables = sfnt.readUInt16BE(4);
      expect(numTables).toBe(woff.readUInt16BE(12));
      expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4));
      // searchRange = 16 · 2^⌊log2 n⌋, entrySelector = ⌊log2 n⌋, rangeShift = 16n − searchRange.
      const pow = 2 ** Math.floor(Math.log2(numTables));
      expect([sfnt.readUInt16BE(6), sfnt.readUInt16BE(8), sfnt.readUInt16BE(10)]).toEqual([
        16 * pow,
        Math.log2(pow),
        16 * numTables - 16 * pow,
      ]);
      // The total size the WOFF header promises for the unpacked font.
      expect(sfnt.length).toBe(woff.readUInt32BE(16));
      for (let i = 0; i < numTables; i++) {
        const tag = sfnt.toString('latin1', 12 + i * 16, 16 + i * 16);
        const offset = sfnt.readUInt32BE(20 + i * 16);
        expect(offset % 4).toBe(0);
        const table = Buffer.from(sfnt.subarray(offset, offset + sfnt.readUInt32BE(24 + i * 16)));
        // 'head' is summed with its checkSumAdjustment field (bytes 8–11) taken as zero.
        if (tag === 'head') table.fill(0, 8, 12);
        expect(checksum(table)).toBe(sfnt.readUInt32BE(16 + i * 16));
      }
    });
  }

  it('refuses a file that is not WOFF 1.0', () => {
    expect(() => woffToSfnt(Buffer.from('wOF2\0\0\0\0'.padEnd(64, '\0')))).toThrow('not a WOFF 1.0 file');
  });
});
