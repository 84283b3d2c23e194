import sharp from 'sharp';
import { srgbEncode } from '../color/srgb';
import { solveHomography, applyHomography, type Point } from '../match/homography';
import { gaussianBlur, modelLight } from '../match/model';
import type { MatchLayout } from '../match/pattern';
import { bilinear } from '../match/photo';
import type { PanelParams } from '../model/parameters';
import { outputUniforms } from '../pipeline/output/uniforms';
import type { RgbaImage } from '../pipeline/types';

/** How a synthetic photo of the match pattern is taken. */
export interface SyntheticShot {
  /** Output pixels per cell pitch the pattern is rendered at before the camera sees it. */
  scale: number;
  /** Photo size, pixels. */
  width: number;
  height: number;
  /** Where the panel's corners land in the photo (top-left, top-right, bottom-right, bottom-left): the perspective. */
  corners: Point[];
  /** Largest linear channel of a fully lit aperture in the photo (0–1). */
  exposure: number;
  /** Camera blur σ in photo pixels (in linear light, as a lens blurs). */
  blur: number;
  /** Room light reflected by the panel face, linear, as a share of the exposure (keeps black off the camera's floor). */
  ambient: number;
  /** Sensor noise: σ = noise · √(light + 0.01) in linear light (shot noise over a floor), before the camera's curve. */
  noise: number;
  /** JPEG quality (sharp). */
  quality: number;
  seed: number;
  /** The pattern on the panel: patternFor the look the fit starts from (or another, for the wrong-pattern test). */
  layout: MatchLayout;
}

/** A synthetic photo: the JPEG, its decoded pixels, and where the corner squares' centres truly are. */
export interface SyntheticPhoto {
  jpeg: Buffer;
  image: RgbaImage;
  fiducials: Point[];
}

/** A small deterministic generator (mulberry32) and Gaussian noise from it (Box–Muller). */
function gaussian(seed: number): () => number {
  let a = seed >>> 0;
  const next = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(next() || 1e-12)) * Math.cos(2 * Math.PI * next());
}

/**
 * A photo of a panel showing the match pattern, made from the pipeline with known parameters:
 * the pattern's light in the emission colour, seen in perspective, blurred, noised and
 * JPEG-compressed with sharp. Test and benchmark data only.
 */
export async function syntheticPhoto(truth: PanelParams, shot: SyntheticShot): Promise<SyntheticPhoto> {
  const { layout } = shot;
  const light = modelLight(layout.levels, truth, shot.scale);
  const u = outputUniforms(truth, shot.scale);
  // Panel output pixels → photo pixels, from the panel's four corners.
  const panelCorners: Point[] = [
    [0, 0],
    [light.width, 0],
    [light.width, light.height],
    [0, light.height],
  ];
  const h = solveHomography(panelCorners, shot.corners);
  const noise = gaussian(shot.seed);
  const colour = u.colour.map((c) => (c * shot.exposure) / Math.max(...u.colour));
  // The scene's light in the photo's pixels, blurred by the lens in linear light.
  const seen = new Float32Array(shot.width * shot.height);
  const m = h.inverse;
  for (let y = 0; y < shot.height; y++) {
    for (let x = 0; x < shot.width; x++) {
      const [cx, cy] = [x + 0.5, y + 0.5];
      const w = m[2] * cx + m[5] * cy + m[8];
      seen[y * shot.width + x] = bilinear(
        light.data,
        light.width,
        light.height,
        (m[0] * cx + m[3] * cy + m[6]) / w,
        (m[1] * cx + m[4] * cy + m[7]) / w,
      );
    }
  }
  const blurred = gaussianBlur({ width: shot.width, height: shot.height, data: seen }, shot.blur).data;
  const rgb = new Uint8Array(shot.width * shot.height * 3);
  for (let i = 0; i < blurred.length; i++) {
    for (let c = 0; c < 3; c++) {
      // Sensor noise in linear light, before the camera's curve: shot noise (∝ √signal) over a read-noise floor.
      const v = (blurred[i] + shot.ambient) * colour[c];
      const noisy = v + shot.noise * Math.sqrt(v + 0.01) * noise();
      rgb[i * 3 + c] = Math.round(srgbEncode(Math.min(1, Math.max(0, noisy))) * 255);
    }
  }
  const jpeg = await sharp(rgb, { raw: { width: shot.width, height: shot.height, channels: 3 } })
    .jpeg({ quality: shot.quality, chromaSubsampling: '4:4:4' })
    .toBuffer();
  const decoded = await sharp(jpeg).ensureAlpha().raw().toBuffer({ resolveWithObject: true });
  const image = { width: decoded.info.width, height: decoded.info.height, data: new Uint8Array(decoded.data) };
  const fiducials = layout.fiducials.map(([cx, cy]) => applyHomography(h.forward, cx * u.cellW, cy * u.cellH));
  return { jpeg, image, fiducials };
}
