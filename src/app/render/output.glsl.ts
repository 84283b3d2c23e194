/**
 * The output-resolution stages in GLSL ES 3.00. The separable coverage weights — exact aperture
 * overlap, or the CRT line integral — and the glow sample coordinates come precomputed per
 * output column and row from the same functions the CPU composer uses (compose.ts: apertureTaps,
 * lineTaps, glowTaps), uploaded as small float textures. The shader fetches them by hand (no
 * hardware filtering) and forms v = direct + bilinear glow; light, exposure, soft knee and sRGB
 * encode (formulas.ts) are a smooth function of v per channel, tabulated finely by
 * encode-table.ts and interpolated here. Every constant comes from outputUniforms().
 */
import { ENCODE_STEPS, ENCODE_WIDTH } from './encode-table';

export const FULLSCREEN_VERTEX = /* glsl */ `#version 300 es
in vec2 position;
void main() { gl_Position = vec4(position, 0.0, 1.0); }
`;


const HEADER = /* glsl */ `#version 300 es
precision highp float;
precision highp int;
#define ENCODE_STEPS ${ENCODE_STEPS}
#define ENCODE_WIDTH ${ENCODE_WIDTH}
uniform highp sampler2D emission;
uniform highp sampler2D glow;
// Per output column: (first cell, its coverage, next cell's coverage, glow sample u).
uniform highp sampler2D columnTaps;
// Per output row: matrix (first row, coverage, next row's coverage, glow sample v);
// CRT: lineTaps holds (line index, weight) pairs, lineStride per row, and rowTaps.w is v.
uniform highp sampler2D rowTaps;
uniform highp sampler2D lineTaps;
uniform ivec2 grid;
uniform ivec2 glowSize;
uniform vec2 outputSize;
uniform int crt;
uniform int lineStride;
uniform float directShare;
// Light, exposure, soft knee and sRGB encode of v, tabulated per channel (encodeTable.ts).
uniform highp sampler2D encodeTable;
uniform float tableScale;
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
  // Bilinear glow by hand: four texel fetches at the precomputed sample coordinates.
  int gx0 = int(floor(cx.w));
  int gy0 = int(floor(ry.w));
  float tx = cx.w - float(gx0);
  float ty = ry.w - float(gy0);
  int gx1 = min(gx0 + 1, glowSize.x - 1);
  int gy1 = min(gy0 + 1, glowSize.y - 1);
  // Skip the taps whose weight is zero (the glow grid often lines up with the pixels).
  float top = tx > 0.0 ? glowAt(gx0, gy0) * (1.0 - tx) + glowAt(gx1, gy0) * tx : glowAt(gx0, gy0);
  float g = top;
  if (ty > 0.0) {
    float bottom = tx > 0.0 ? glowAt(gx0, gy1) * (1.0 - tx) + glowAt(gx1, gy1) * tx : glowAt(gx0, gy1);
    g = top * (1.0 - ty) + bottom * ty;
  }
  return directShare * direct + g;
}
`;

/** Light, exposure, soft knee and sRGB encode of v, from the table. */
const ENCODE_V = /* glsl */ `
vec4 encodeV(float v) {
  // Linear interpolation between table entries, written out (the texture is not filtered).
  float f = clamp(v * tableScale, 0.0, float(ENCODE_STEPS - 1) - 0.0001);
  int i = int(f);
  float t = f - float(i);
  vec3 a = texelFetch(encodeTable, ivec2(i % ENCODE_WIDTH, i / ENCODE_WIDTH), 0).rgb;
  vec3 b = texelFetch(encodeTable, ivec2((i + 1) % ENCODE_WIDTH, (i + 1) / ENCODE_WIDTH), 0).rgb;
  return vec4(mix(a, b, t), 1.0);
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
