/**
 * The output-resolution stages in GLSL ES 3.00. The separable coverage weights — exact aperture
 * overlap, or the CRT line integral — and the glow sample coordinates come precomputed per
 * output column and row from the same functions the CPU composer uses (compose.ts: apertureTaps,
 * lineTaps, glowTaps), uploaded as small float textures. The shader fetches them by hand (no
 * hardware filtering) and forms v = direct + bilinear glow, in the CPU composer's order of
 * operations; light, exposure, soft knee and sRGB encode (formulas.ts) are the composer's own
 * pixel table and per-channel code thresholds on v (threshold-table.ts). Every constant comes
 * from outputUniforms().
 */
import { THRESHOLD_CODES, WORD_TABLE_WIDTH } from './threshold-table';

export const FULLSCREEN_VERTEX = /* glsl */ `#version 300 es
in vec2 position;
void main() { gl_Position = vec4(position, 0.0, 1.0); }
`;

const HEADER = /* glsl */ `#version 300 es
precision highp float;
precision highp int;
#define THRESHOLD_CODES ${THRESHOLD_CODES}
#define WORD_TABLE_WIDTH ${WORD_TABLE_WIDTH}
#define REFINE_STEPS 4
uniform highp sampler2D emission;
uniform highp sampler2D glow;
// Per output column, texel row 0: (first cell, its coverage, next cell's coverage, 0);
// texel row 1: (first glow sample, its weight, the next sample's weight, 0), as glowTaps gives them.
uniform highp sampler2D columnTaps;
// Per output row, the same for matrix panels; on a CRT lineTaps holds (line index, weight)
// pairs, lineStride per row, and only rowTaps' glow row is used.
uniform highp sampler2D rowTaps;
uniform highp sampler2D lineTaps;
uniform ivec2 grid;
uniform ivec2 glowSize;
uniform vec2 outputSize;
uniform int crt;
uniform int lineStride;
uniform float directShare;
// Per code value c (texel c): the v from which red, green and blue show c (threshold-table.ts).
uniform highp sampler2D thresholds;
// The composer's pixel table over [0, vMax), perV cells per unit of v (threshold-table.ts wordTable).
uniform highp usampler2D words;
uniform float perV;
uniform float vMax;
// The codes of v = 0 and of any v ≥ vMax (constants).
uniform vec3 zeroCodes;
uniform vec3 topCodes;
out vec4 outColor;
`;

/** v = direct light × direct share + bilinear glow, for the output pixel being shaded. */
const COMPUTE_V = /* glsl */ `
float cellAt(int c, int r) { return texelFetch(emission, ivec2(c, r), 0).r; }
float glowAt(int x, int y) { return texelFetch(glow, ivec2(x, y), 0).r; }
float computeV() {
  int X = int(gl_FragCoord.x);
  int Y = int(outputSize.y) - 1 - int(gl_FragCoord.y);
  vec4 cx = texelFetch(columnTaps, ivec2(X, 0), 0);
  vec4 ry = texelFetch(rowTaps, ivec2(Y, 0), 0);
  int c0 = int(cx.x);
  int c1 = min(c0 + 1, grid.x - 1);
  float direct = 0.0;
  if (crt == 0) {
    int r0 = int(ry.x);
    int r1 = min(r0 + 1, grid.y - 1);
    // Fetch only the cells that cover this pixel (most pixels lie inside one aperture).
    if (ry.y > 0.0) direct += ry.y * (cellAt(c0, r0) * cx.y + (cx.z > 0.0 ? cellAt(c1, r0) * cx.z : 0.0));
    if (ry.z > 0.0) direct += ry.z * (cellAt(c0, r1) * cx.y + (cx.z > 0.0 ? cellAt(c1, r1) * cx.z : 0.0));
  } else {
    for (int k = 0; k < 64; k++) {
      if (k >= lineStride) break;
      vec2 tap = texelFetch(lineTaps, ivec2(k, Y), 0).rg;
      if (tap.y == 0.0) continue;
      int r = int(tap.x);
      direct += tap.y * (cellAt(c0, r) * cx.y + (cx.z > 0.0 ? cellAt(c1, r) * cx.z : 0.0));
    }
  }
  // Bilinear glow by hand at the composer's taps: across within each glow row, then down.
  vec4 gcx = texelFetch(columnTaps, ivec2(X, 1), 0);
  vec4 gry = texelFetch(rowTaps, ivec2(Y, 1), 0);
  int gx0 = int(gcx.x);
  int gy0 = int(gry.x);
  int gx1 = min(gx0 + 1, glowSize.x - 1);
  int gy1 = min(gy0 + 1, glowSize.y - 1);
  // Skip the taps whose weight is zero (the glow grid often lines up with the pixels): x·0 is 0.
  float top = glowAt(gx0, gy0) * gcx.y + (gcx.z > 0.0 ? glowAt(gx1, gy0) * gcx.z : 0.0);
  float bottom = gry.z > 0.0 ? glowAt(gx0, gy1) * gcx.y + (gcx.z > 0.0 ? glowAt(gx1, gy1) * gcx.z : 0.0) : 0.0;
  float g = top * gry.y + bottom * gry.z;
  return directShare * direct + g;
}
`;

/**
 * Light, exposure, soft knee and sRGB encode of v: the codes of v = 0 and v ≥ vMax as given; in
 * between, the composer's pixel table (one fetch; near a threshold, a lower bound stepped up past
 * the thresholds v has reached); anything else (never light), each channel's code by bisection.
 */
const ENCODE_V = /* glsl */ `
float thresholdOf(int code, int channel) { return texelFetch(thresholds, ivec2(code, 0), 0)[channel]; }
vec4 encodeV(float v) {
  if (v == 0.0) return vec4(zeroCodes / 255.0, 1.0);
  if (v >= vMax) return vec4(topCodes / 255.0, 1.0);
  if (v > 0.0) {
    ivec2 size = textureSize(words, 0);
    int cell = min(int(v * perV), size.x * size.y - 1);
    uvec4 word = texelFetch(words, ivec2(cell % WORD_TABLE_WIDTH, cell / WORD_TABLE_WIDTH), 0);
    ivec3 code = ivec3(word.rgb);
    if (word.a == 255u) return vec4(vec3(code) / 255.0, 1.0);
    for (int step = 0; step < REFINE_STEPS; step++) {
      bvec3 up = bvec3(
        code.r < THRESHOLD_CODES - 1 && v >= thresholdOf(code.r + 1, 0),
        code.g < THRESHOLD_CODES - 1 && v >= thresholdOf(code.g + 1, 1),
        code.b < THRESHOLD_CODES - 1 && v >= thresholdOf(code.b + 1, 2));
      if (!any(up)) return vec4(vec3(code) / 255.0, 1.0);
      code += ivec3(up);
    }
    // Still climbing after that many steps (very dense thresholds): bisection below.
  }
  ivec3 lo = ivec3(0);
  ivec3 hi = ivec3(THRESHOLD_CODES - 1);
  for (int step = 0; step < 8; step++) {
    ivec3 mid = (lo + hi + 1) / 2;
    vec3 t = vec3(thresholdOf(mid.r, 0), thresholdOf(mid.g, 1), thresholdOf(mid.b, 2));
    bvec3 above = greaterThanEqual(vec3(v), t);
    lo = ivec3(above.r ? mid.r : lo.r, above.g ? mid.g : lo.g, above.b ? mid.b : lo.b);
    hi = ivec3(above.r ? hi.r : mid.r - 1, above.g ? hi.g : mid.g - 1, above.b ? hi.b : mid.b - 1);
  }
  return vec4(vec3(lo) / 255.0, 1.0);
}
`;

/** One pass: v and its encoding (used when float render targets are not available). */
export const PANEL_FRAGMENT = `${HEADER}${COMPUTE_V}${ENCODE_V}
void main() { outColor = encodeV(computeV()); }
`;

/** First pass: v into a float texture (redone only when the panel stages or geometry change). */
export const V_FRAGMENT = `${HEADER.replace('out vec4 outColor;', 'out float outV;')}${COMPUTE_V}
void main() { outV = computeV(); }
`;

/** Second pass: the cached v encoded for display (every light or colour edit). */
export const ENCODE_FRAGMENT = `${HEADER}uniform highp sampler2D vField;
${ENCODE_V}
// The first pass wrote each pixel's v at this same fragment position.
void main() { outColor = encodeV(texelFetch(vField, ivec2(gl_FragCoord.xy), 0).r); }
`;
