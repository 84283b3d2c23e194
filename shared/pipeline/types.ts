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

/**
 * Rows made by spreading a coarser image: row y, sample c·m + k, is
 * (source[⌊y/m⌋·cols + c] · down[y mod m]) · across[k], in float64, rounded to float32. A row
 * function that makes such rows may carry this description: the kernels then make the rows
 * themselves, with the same bits.
 */
export interface ExpandedRows {
  source: Float32Array;
  cols: number;
  m: number;
  across: Float64Array;
  down: Float64Array;
}

/** `row(y, into, offset)` writes row y at into[offset…]; `expanded` says how, when it spreads a coarser image. */
export type RowSource = ((y: number, into: Float32Array, offset: number) => void) & { expanded?: ExpandedRows };
