import sharp from 'sharp';
import { pngBomb, pngChunk } from './images';

/** One hostile file: what it is, its bytes, and the multipart fields it is sent with. */
export interface HostileCase {
  name: string;
  bytes: Buffer;
  fields?: Record<string, string>;
  /** A valid image with something odd inside: may be accepted, must never be a 5xx. */
  mayPass?: boolean;
}

/** Small valid files of the four accepted types, made by sharp from one picture. */
export async function validBases(): Promise<{ name: string; bytes: Buffer }[]> {
  const picture = sharp({ create: { width: 24, height: 16, channels: 4, background: { r: 255, g: 170, b: 0, alpha: 1 } } }).composite([
    {
      input: Buffer.from([0, 0, 0, 255].concat(...Array(63).fill([40, 20, 0, 255]))),
      raw: { width: 8, height: 8, channels: 4 },
      left: 4,
      top: 4,
    },
  ]);
  const png = await picture.clone().png().toBuffer();
  const raw = await sharp(png).raw().toBuffer();
  const frames = sharp(Buffer.concat([raw, Buffer.from(raw).reverse()]), { raw: { width: 24, height: 32, channels: 4, pageHeight: 16 } });
  return [
    { name: 'png', bytes: png },
    {
      name: 'gif',
      bytes: await frames
        .clone()
        .gif({ delay: [100, 100] })
        .toBuffer(),
    },
    { name: 'jpeg', bytes: await picture.clone().jpeg({ quality: 80 }).toBuffer() },
    { name: 'webp', bytes: await picture.clone().webp({ quality: 80 }).toBuffer() },
  ];
}

/** A GIF of `frames` 1 × 1 frames (a frame bomb: a few bytes a frame). */
export function gifFrameBomb(frames: number): Buffer {
  const header = Buffer.from('GIF89a\x01\x00\x01\x00\x80\x00\x00\xff\xb0\x00\x00\x00\x00', 'latin1');
  const frame = Buffer.from('\x21\xf9\x04\x00\x0a\x00\x00\x00\x2c\x00\x00\x00\x00\x01\x00\x01\x00\x00\x02\x02\x44\x01\x00', 'latin1');
  return Buffer.concat([header, ...Array(frames).fill(frame), Buffer.from(';', 'latin1')]);
}

/**
 * The named hostile corpus (security items 17–20, 32): truncations, bad checksums and lengths,
 * pixel, frame and sprite-sheet bombs, markup renamed as images, and polyglots.
 */
export async function hostileCorpus(): Promise<HostileCase[]> {
  const bases = await validBases();
  const byName = Object.fromEntries(bases.map((b) => [b.name, b.bytes]));
  const cases: HostileCase[] = [];
  for (const { name, bytes } of bases) {
    for (const keep of [0.1, 0.5, 0.9])
      cases.push({ name: `${name} truncated to ${keep * 100} %`, bytes: bytes.subarray(0, Math.floor(bytes.length * keep)) });
    cases.push({ name: `${name} header only`, bytes: bytes.subarray(0, 16) });
  }
  const png = byName.png;
  const badCrc = Buffer.from(png);
  badCrc.writeUInt32BE((badCrc.readUInt32BE(29) ^ 0xffffffff) >>> 0, 29); // IHDR's CRC (8 + 4 + 4 + 13 bytes in)
  cases.push({ name: 'png with a wrong IHDR CRC', bytes: badCrc });
  const idatAt = png.indexOf('IDAT') - 4;
  const longChunk = Buffer.from(png);
  longChunk.writeUInt32BE(0x7fffffff, idatAt);
  cases.push({ name: 'png whose IDAT claims 2 GiB', bytes: longChunk });
  const zeroSize = Buffer.from(png);
  zeroSize.writeUInt32BE(0, 16);
  cases.push({ name: 'png of width 0', bytes: zeroSize });
  cases.push({ name: 'png pixel bomb 20000 × 20000', bytes: pngBomb(20000, 20000) });
  cases.push({ name: 'png pixel bomb 65535 × 65535', bytes: pngBomb(65535, 65535) });
  cases.push({ name: 'gif frame bomb, 10 000 frames', bytes: gifFrameBomb(10_000) });
  const flat = await sharp({ create: { width: 4000, height: 4000, channels: 3, background: '#ffb000' } })
    .png({ compressionLevel: 9 })
    .toBuffer();
  cases.push({ name: 'sprite-sheet bomb: 4000 × 4000 in 1 × 1 frames', bytes: flat, fields: { frameWidth: '1', frameHeight: '1' } });
  cases.push({ name: 'sprite-sheet bomb: 4000 × 4000 in 4 × 4 frames', bytes: flat, fields: { frameWidth: '4', frameHeight: '4' } });
  cases.push({
    name: 'svg named .png',
    bytes: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="9999" height="9999"><script>alert(1)</script></svg>'),
  });
  cases.push({ name: 'html named .png', bytes: Buffer.from('<!doctype html><script>alert(document.cookie)</script>') });
  cases.push({ name: 'empty file', bytes: Buffer.alloc(0) });
  cases.push({
    name: 'png signature then html',
    bytes: Buffer.concat([png.subarray(0, 8), Buffer.from('<html><script>alert(1)</script>')]),
  });
  cases.push({ name: 'gif header then javascript (GIFAR-style)', bytes: Buffer.from('GIF89a/*\x01\x00\x01\x00*/=alert(1);//', 'latin1') });
  cases.push({
    name: 'jpeg markers then pdf',
    bytes: Buffer.concat([Buffer.from([0xff, 0xd8, 0xff, 0xe0]), Buffer.from('%PDF-1.4\n1 0 obj<<>>endobj\n')]),
  });
  cases.push({
    name: 'webp riff with a tiff inside',
    bytes: Buffer.concat([
      Buffer.from('RIFF\x20\x00\x00\x00WEBPVP8 ', 'latin1'),
      Buffer.from('II*\x00\x08\x00\x00\x00', 'latin1'),
      Buffer.alloc(16),
    ]),
  });
  cases.push({
    name: 'png with a 5 MB tEXt chunk',
    bytes: Buffer.concat([png.subarray(0, 33), pngChunk('tEXt', Buffer.alloc(5 * 1024 * 1024, 0x41)), png.subarray(33)]),
    mayPass: true,
  });
  return cases;
}

/** Flips `count` bits of a copy of `bytes` at the given positions (positions modulo the bit length). */
export function flipBits(bytes: Buffer, positions: number[]): Buffer {
  const out = Buffer.from(bytes);
  for (const p of positions) {
    const bit = p % (out.length * 8);
    out[bit >> 3] ^= 1 << (bit & 7);
  }
  return out;
}
