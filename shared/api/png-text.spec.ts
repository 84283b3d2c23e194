import sharp from 'sharp';
import zlib from 'node:zlib';
import { crc32, readPngText, withPngText } from './png-text';

const png = () =>
  sharp({ create: { width: 4, height: 3, channels: 3, background: { r: 255, g: 176, b: 0 } } })
    .png()
    .toBuffer();

test('CRC-32 equals the reference implementation in zlib [general-purpose reference library], and the PNG check value of "IEND"', () => {
  for (const text of ['', 'IEND', 'iTXtEmberline', '123456789']) {
    const bytes = new TextEncoder().encode(text);
    expect(crc32(bytes)).toBe(zlib.crc32(bytes));
  }
  // The IEND chunk's CRC printed in every PNG file [PNG 1.2, from memory].
  expect(crc32(new TextEncoder().encode('IEND')).toString(16)).toBe('ae426082');
});

test('text goes in right after IHDR, every chunk CRC checks out, and the image still decodes the same', async () => {
  const original = new Uint8Array(await png());
  const parameters = JSON.stringify({ glass: { glowRadiusMm: 0.25 }, note: 'Zündschlüssel – amber' });
  const tagged = withPngText(original, { Software: 'Emberline', 'Emberline parameters': parameters });
  // Walk the chunks: IHDR first, then ours, each CRC valid.
  const view = new DataView(tagged.buffer);
  const types: string[] = [];
  for (let at = 8; at < tagged.length;) {
    const length = view.getUint32(at);
    types.push(String.fromCharCode(...tagged.subarray(at + 4, at + 8)));
    expect(view.getUint32(at + 8 + length)).toBe(zlib.crc32(tagged.subarray(at + 4, at + 8 + length)));
    at += 12 + length;
  }
  expect(types.slice(0, 3)).toEqual(['IHDR', 'iTXt', 'iTXt']);
  expect(readPngText(tagged)).toEqual({ Software: 'Emberline', 'Emberline parameters': parameters });
  const [a, b] = await Promise.all([sharp(original).raw().toBuffer(), sharp(Buffer.from(tagged)).raw().toBuffer()]);
  expect(b.equals(a)).toBe(true);
});

test('not a PNG, or a keyword a PNG cannot hold, is refused with the reason', async () => {
  const image = new Uint8Array(await png());
  expect(() => withPngText(new Uint8Array(40), { a: 'b' })).toThrow('not a PNG file');
  expect(() => withPngText(image, { '': 'x' })).toThrow('1 to 79 Latin-1 characters');
  expect(() => withPngText(image, { ['x'.repeat(80)]: 'x' })).toThrow('1 to 79 Latin-1 characters');
});
