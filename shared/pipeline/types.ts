/** An 8-bit sRGB image with straight alpha, row-major RGBA. */
export interface RgbaImage {
  width: number;
  height: number;
  data: Uint8Array | Uint8ClampedArray;
}

/** A float field at panel (or sub-panel) resolution, row-major, one value per sample. */
export interface Field {
  width: number;
  height: number;
  data: Float32Array;
}

/** One animation frame: the image and how long it shows, in ms. */
export interface Frame {
  image: RgbaImage;
  delayMs: number;
}
