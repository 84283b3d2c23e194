/**
 * The output-resolution stages in GLSL ES 3.00, formula for formula as in
 * shared/pipeline/output/formulas.ts and compose.ts: exact aperture overlap (or the CRT line
 * integral by the same erf polynomial), glow by four texel fetches and bilinear weights written
 * out by hand (no hardware filtering), then light, soft knee and sRGB encode. Every constant
 * comes from outputUniforms().
 */
export const FULLSCREEN_VERTEX = /* glsl */ `#version 300 es
in vec2 position;
void main() { gl_Position = vec4(position, 0.0, 1.0); }
`;

const FORMULAS = /* glsl */ `
float overlap1d(float a0, float a1, float b0, float b1) { return max(0.0, min(a1, b1) - max(a0, b0)); }
float apertureCoverage(float p, float c, float s, float f) {
  float centre = (c + 0.5) * s;
  float half_ = f * s * 0.5;
  return overlap1d(p, p + 1.0, centre - half_, centre + half_);
}
// Abramowitz & Stegun 7.1.26.
float erfApprox(float x) {
  float s = sign(x);
  float a = abs(x);
  float t = 1.0 / (1.0 + 0.3275911 * a);
  float y = 1.0 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * exp(-a * a);
  return s * y;
}
float lineCoverage(float p, float r, float s, float sigma) {
  float centre = (r + 0.5) * s;
  float k = 1.0 / (1.41421356237 * sigma);
  return s * 0.5 * (erfApprox((p + 1.0 - centre) * k) - erfApprox((p - centre) * k));
}
float softKnee(float x, float k) {
  if (x <= k || k >= 1.0) return min(x, 1.0);
  float span = 1.0 - k;
  return k + span * (1.0 - exp(-(x - k) / span));
}
float srgbEncode(float l) {
  l = clamp(l, 0.0, 1.0);
  return l <= 0.0031308 ? 12.92 * l : 1.055 * pow(l, 1.0 / 2.4) - 0.055;
}
`;

export const PANEL_FRAGMENT = /* glsl */ `#version 300 es
precision highp float;
precision highp int;
uniform highp sampler2D emission;
uniform highp sampler2D glow;
uniform ivec2 grid;
uniform ivec2 glowSize;
uniform vec2 outputSize;
uniform vec2 cellSize;
uniform vec2 fill;
uniform int crt;
uniform float spotSigma;
uniform int lineReach;
uniform float directShare;
uniform float glowOversample;
uniform vec3 colour;
uniform float ambient;
uniform float peak;
uniform float offLevel;
uniform float gain;
uniform float knee;
out vec4 outColor;
${FORMULAS}
float cellAt(int c, int r) { return texelFetch(emission, ivec2(c, r), 0).r; }
float glowAt(int x, int y) { return texelFetch(glow, ivec2(x, y), 0).r; }
float glowTap(float p, float cell, int samples, out int i0, out int i1) {
  float u = clamp((p + 0.5) / cell * glowOversample - 0.5, 0.0, float(samples - 1));
  i0 = int(floor(u));
  i1 = min(i0 + 1, samples - 1);
  return u - float(i0);
}
void main() {
  float X = floor(gl_FragCoord.x);
  float Y = outputSize.y - 1.0 - floor(gl_FragCoord.y);
  int c0 = int(floor(X / cellSize.x));
  float direct = 0.0;
  if (crt == 0) {
    int r0 = int(floor(Y / cellSize.y));
    for (int dy = 0; dy <= 1; dy++) {
      int r = r0 + dy;
      if (r >= grid.y) break;
      float wy = apertureCoverage(Y, float(r), cellSize.y, fill.y);
      if (wy == 0.0) continue;
      for (int dx = 0; dx <= 1; dx++) {
        int c = c0 + dx;
        if (c >= grid.x) break;
        direct += wy * cellAt(c, r) * apertureCoverage(X, float(c), cellSize.x, fill.x);
      }
    }
  } else {
    int centre = int(floor((Y + 0.5) / cellSize.y));
    for (int k = -16; k <= 16; k++) {
      if (k < -lineReach || k > lineReach) continue;
      int r = centre + k;
      if (r < 0 || r >= grid.y) continue;
      float wy = lineCoverage(Y, float(r), cellSize.y, spotSigma);
      float row = 0.0;
      for (int dx = 0; dx <= 1; dx++) {
        int c = c0 + dx;
        if (c >= grid.x) break;
        row += cellAt(c, r) * apertureCoverage(X, float(c), cellSize.x, fill.x);
      }
      direct += wy * row;
    }
  }
  int gx0; int gx1; int gy0; int gy1;
  float tx = glowTap(X, cellSize.x, glowSize.x, gx0, gx1);
  float ty = glowTap(Y, cellSize.y, glowSize.y, gy0, gy1);
  float g = (glowAt(gx0, gy0) * (1.0 - tx) + glowAt(gx1, gy0) * tx) * (1.0 - ty) + (glowAt(gx0, gy1) * (1.0 - tx) + glowAt(gx1, gy1) * tx) * ty;
  float v = directShare * direct + g;
  float lum = v * peak + offLevel;
  vec3 display = (colour * lum + ambient) * gain;
  outColor = vec4(srgbEncode(softKnee(display.r, knee)), srgbEncode(softKnee(display.g, knee)), srgbEncode(softKnee(display.b, knee)), 1.0);
}
`;

/** A plain textured draw of an RGBA8 image of the output size: the benchmark's baseline. */
export const PASSTHROUGH_FRAGMENT = /* glsl */ `#version 300 es
precision highp float;
uniform highp sampler2D image;
uniform vec2 outputSize;
out vec4 outColor;
void main() {
  ivec2 p = ivec2(int(gl_FragCoord.x), int(outputSize.y - 1.0 - floor(gl_FragCoord.y)));
  outColor = texelFetch(image, p, 0);
}
`;
