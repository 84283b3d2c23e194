import { apertureTaps, glowTaps, lineTaps } from '@shared/pipeline/output/compose';
import type { OutputUniforms } from '@shared/pipeline/output/uniforms';
import type { Field } from '@shared/pipeline/types';
import { THRESHOLD_CODES, thresholdTable, wordTable } from './threshold-table';
import { ENCODE_FRAGMENT, FULLSCREEN_VERTEX, PANEL_FRAGMENT, V_FRAGMENT } from './output.glsl';

function compile(gl: WebGL2RenderingContext, vertex: string, fragment: string): WebGLProgram {
  const program = gl.createProgram()!;
  for (const [type, source] of [
    [gl.VERTEX_SHADER, vertex],
    [gl.FRAGMENT_SHADER, fragment],
  ] as const) {
    const shader = gl.createShader(type)!;
    gl.shaderSource(shader, source);
    gl.compileShader(shader);
    if (!gl.getShaderParameter(shader, gl.COMPILE_STATUS)) throw new Error(`shader did not compile: ${gl.getShaderInfoLog(shader)}`);
    gl.attachShader(program, shader);
  }
  gl.bindAttribLocation(program, 0, 'position');
  gl.linkProgram(program);
  if (!gl.getProgramParameter(program, gl.LINK_STATUS)) throw new Error(`program did not link: ${gl.getProgramInfoLog(program)}`);
  return program;
}

/**
 * WebGL2 glue for the output stages: the emission and glow fields as R32F textures read with
 * texelFetch. With float render targets, a first pass writes v (direct + glow) into an R32F
 * texture and a second encodes it for display, so light and colour edits redo only the second;
 * without them, one combined pass.
 */
export class PanelRenderer {
  private readonly program: WebGLProgram;
  private readonly vProgram?: WebGLProgram;
  private readonly encodeProgram?: WebGLProgram;
  private readonly vTex?: WebGLTexture;
  private readonly vFbo?: WebGLFramebuffer;
  private vKey = '';
  private uploads = 0;
  private readonly emissionTex: WebGLTexture;
  private readonly glowTex: WebGLTexture;
  private readonly columnTex: WebGLTexture;
  private readonly rowTex: WebGLTexture;
  private readonly lineTex: WebGLTexture;
  private readonly thresholdTex: WebGLTexture;
  private readonly wordTex: WebGLTexture;
  private words?: ReturnType<typeof wordTable>;
  private encodeKey = '';
  private grid = [0, 0];
  private glowSize = [0, 0];
  private tapsKey = '';
  private lineStride = 0;

  /** A renderer, or null when the browser has no WebGL2 (the caller falls back to the CPU). */
  static create(canvas: HTMLCanvasElement | OffscreenCanvas): PanelRenderer | null {
    const gl = canvas.getContext('webgl2', {
      antialias: false,
      preserveDrawingBuffer: true,
      premultipliedAlpha: false,
      alpha: false,
    }) as WebGL2RenderingContext | null;
    return gl ? new PanelRenderer(gl) : null;
  }

  private constructor(readonly gl: WebGL2RenderingContext) {
    this.program = compile(gl, FULLSCREEN_VERTEX, PANEL_FRAGMENT);
    if (gl.getExtension('EXT_color_buffer_float')) {
      this.vProgram = compile(gl, FULLSCREEN_VERTEX, V_FRAGMENT);
      this.encodeProgram = compile(gl, FULLSCREEN_VERTEX, ENCODE_FRAGMENT);
      this.vTex = gl.createTexture()!;
      this.vFbo = gl.createFramebuffer()!;
    }
    const buffer = gl.createBuffer();
    gl.bindBuffer(gl.ARRAY_BUFFER, buffer);
    gl.bufferData(gl.ARRAY_BUFFER, new Float32Array([-1, -1, 3, -1, -1, 3]), gl.STATIC_DRAW);
    gl.enableVertexAttribArray(0);
    gl.vertexAttribPointer(0, 2, gl.FLOAT, false, 0, 0);
    this.emissionTex = this.nearestTexture();
    this.glowTex = this.nearestTexture();
    this.columnTex = this.nearestTexture();
    this.rowTex = this.nearestTexture();
    this.lineTex = this.nearestTexture();
    this.thresholdTex = this.nearestTexture();
    this.wordTex = this.nearestTexture();
  }

  /** The code thresholds and the pixel table on v, rebuilt when the light or colour uniforms change. */
  private uploadThresholds(u: OutputUniforms): void {
    const key = JSON.stringify([u.colour, u.colourY, u.ambientCdM2, u.peakCdM2, u.offCdM2, u.gain, u.knee]);
    if (key === this.encodeKey) return;
    this.encodeKey = key;
    const gl = this.gl;
    gl.bindTexture(gl.TEXTURE_2D, this.thresholdTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA32F, THRESHOLD_CODES, 1, 0, gl.RGBA, gl.FLOAT, thresholdTable(u));
    const words = wordTable(u);
    gl.pixelStorei(gl.UNPACK_ALIGNMENT, 1);
    gl.bindTexture(gl.TEXTURE_2D, this.wordTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA8UI, words.width, words.height, 0, gl.RGBA_INTEGER, gl.UNSIGNED_BYTE, words.texels);
    this.words = words;
  }

  /** Per-column and per-row taps (coverage and glow coordinates), rebuilt when the geometry changes. */
  private uploadTaps(u: OutputUniforms): void {
    const key = JSON.stringify([
      u.width,
      u.height,
      u.cellW,
      u.cellH,
      u.fillX,
      u.fillY,
      u.crt,
      u.spotSigmaPx,
      u.lineCentred,
      u.glowOversample,
      this.glowSize,
      this.grid,
    ]);
    if (key === this.tapsKey) return;
    this.tapsKey = key;
    const gl = this.gl;
    // Two texel rows per axis: the cell taps, then the glow taps, each value exactly as the CPU
    // composer holds it (indices are small integers, weights float32 already).
    const pack = (pixels: number, taps: ReturnType<typeof apertureTaps>, glowAxis: ReturnType<typeof glowTaps>) => {
      const out = new Float32Array(pixels * 8);
      for (let p = 0; p < pixels; p++) {
        out[p * 4] = taps.index[p * taps.stride];
        out[p * 4 + 1] = taps.weight[p * taps.stride];
        out[p * 4 + 2] = taps.stride > 1 ? taps.weight[p * taps.stride + 1] : 0;
        const g = (pixels + p) * 4;
        out[g] = glowAxis.index[p * 2];
        out[g + 1] = glowAxis.weight[p * 2];
        out[g + 2] = glowAxis.index[p * 2 + 1] > glowAxis.index[p * 2] ? glowAxis.weight[p * 2 + 1] : 0;
      }
      return out;
    };
    const columns = pack(
      u.width,
      apertureTaps(u.width, u.cols, u.cellW, u.fillX),
      glowTaps(u.width, this.glowSize[0], u.cellW, u.glowOversample),
    );
    const rowGlow = glowTaps(u.height, this.glowSize[1], u.cellH, u.glowOversample);
    const rows = pack(
      u.height,
      u.crt
        ? { index: new Int32Array(u.height), weight: new Float32Array(u.height), stride: 1 }
        : apertureTaps(u.height, u.rows, u.cellH, u.fillY),
      rowGlow,
    );
    gl.bindTexture(gl.TEXTURE_2D, this.columnTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA32F, u.width, 2, 0, gl.RGBA, gl.FLOAT, columns);
    gl.bindTexture(gl.TEXTURE_2D, this.rowTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA32F, u.height, 2, 0, gl.RGBA, gl.FLOAT, rows);
    const lines = u.crt
      ? lineTaps(u.height, u.rows, u.cellH, u.spotSigmaPx, u.lineCentred)
      : { index: new Int32Array(u.height), weight: new Float32Array(u.height), stride: 1 };
    const pairs = new Float32Array(u.height * lines.stride * 2);
    for (let i = 0; i < u.height * lines.stride; i++) {
      pairs[i * 2] = lines.index[i];
      pairs[i * 2 + 1] = lines.weight[i];
    }
    gl.bindTexture(gl.TEXTURE_2D, this.lineTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RG32F, lines.stride, u.height, 0, gl.RG, gl.FLOAT, pairs);
    this.lineStride = lines.stride;
  }

  private nearestTexture(): WebGLTexture {
    const gl = this.gl;
    const tex = gl.createTexture()!;
    gl.bindTexture(gl.TEXTURE_2D, tex);
    gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MIN_FILTER, gl.NEAREST);
    gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MAG_FILTER, gl.NEAREST);
    gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_WRAP_S, gl.CLAMP_TO_EDGE);
    gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_WRAP_T, gl.CLAMP_TO_EDGE);
    return tex;
  }

  /** Uploads the panel-resolution results of the worker. */
  upload(emission: Float32Array, cols: number, rows: number, glow: Field): void {
    const gl = this.gl;
    gl.pixelStorei(gl.UNPACK_ALIGNMENT, 1);
    gl.bindTexture(gl.TEXTURE_2D, this.emissionTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.R32F, cols, rows, 0, gl.RED, gl.FLOAT, emission);
    gl.bindTexture(gl.TEXTURE_2D, this.glowTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.R32F, glow.width, glow.height, 0, gl.RED, gl.FLOAT, glow.data);
    this.grid = [cols, rows];
    this.glowSize = [glow.width, glow.height];
    this.uploads++;
  }

  /** Replaces the emission only (one refresh of a frame-rate-control cycle over the same glow). */
  uploadEmission(emission: Float32Array): void {
    const gl = this.gl;
    gl.pixelStorei(gl.UNPACK_ALIGNMENT, 1);
    gl.bindTexture(gl.TEXTURE_2D, this.emissionTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.R32F, this.grid[0], this.grid[1], 0, gl.RED, gl.FLOAT, emission);
    this.uploads++;
  }

  /** Draws the output stages with these uniforms (the canvas is resized to the output). */
  draw(u: OutputUniforms): void {
    const gl = this.gl;
    const canvas = gl.canvas;
    if (canvas.width !== u.width || canvas.height !== u.height) {
      canvas.width = u.width;
      canvas.height = u.height;
    }
    gl.viewport(0, 0, u.width, u.height);
    this.uploadTaps(u);
    this.uploadThresholds(u);
    if (!this.vProgram || !this.encodeProgram) {
      this.pass(this.program, u);
      return;
    }
    const key = `${this.uploads}|${this.tapsKey}|${u.directShare}`;
    if (key !== this.vKey) {
      this.vKey = key;
      gl.bindTexture(gl.TEXTURE_2D, this.vTex!);
      gl.texImage2D(gl.TEXTURE_2D, 0, gl.R32F, u.width, u.height, 0, gl.RED, gl.FLOAT, null);
      gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MIN_FILTER, gl.NEAREST);
      gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MAG_FILTER, gl.NEAREST);
      gl.bindFramebuffer(gl.FRAMEBUFFER, this.vFbo!);
      gl.framebufferTexture2D(gl.FRAMEBUFFER, gl.COLOR_ATTACHMENT0, gl.TEXTURE_2D, this.vTex!, 0);
      this.pass(this.vProgram, u);
      gl.bindFramebuffer(gl.FRAMEBUFFER, null);
    }
    this.pass(this.encodeProgram, u, this.vTex);
  }

  /** One full-screen pass of `program` with every texture and uniform it may read. */
  private pass(program: WebGLProgram, u: OutputUniforms, vField?: WebGLTexture): void {
    const gl = this.gl;
    gl.useProgram(program);
    const loc = (name: string) => this.location(program, name);
    const textures: [string, WebGLTexture | undefined][] = [
      ['emission', this.emissionTex],
      ['glow', this.glowTex],
      ['columnTaps', this.columnTex],
      ['rowTaps', this.rowTex],
      ['lineTaps', this.lineTex],
      ['thresholds', this.thresholdTex],
      ['words', this.wordTex],
      ['vField', vField],
    ];
    textures.forEach(([name, tex], unit) => {
      if (!tex) return;
      gl.activeTexture(gl.TEXTURE0 + unit);
      gl.bindTexture(gl.TEXTURE_2D, tex);
      gl.uniform1i(loc(name), unit);
    });
    gl.uniform2i(loc('grid'), this.grid[0], this.grid[1]);
    gl.uniform2i(loc('glowSize'), this.glowSize[0], this.glowSize[1]);
    gl.uniform2f(loc('outputSize'), u.width, u.height);
    gl.uniform1i(loc('crt'), u.crt ? 1 : 0);
    gl.uniform1i(loc('lineStride'), this.lineStride);
    gl.uniform1f(loc('directShare'), u.directShare);
    gl.uniform1f(loc('perV'), this.words!.perV);
    gl.uniform1f(loc('vMax'), this.words!.vMax);
    gl.uniform3fv(loc('zeroCodes'), this.words!.zeroCodes);
    gl.uniform3fv(loc('topCodes'), this.words!.topCodes);
    gl.drawArrays(gl.TRIANGLES, 0, 3);
  }

  private readonly locations = new Map<WebGLProgram, Map<string, WebGLUniformLocation | null>>();
  private location(program: WebGLProgram, name: string): WebGLUniformLocation | null {
    let map = this.locations.get(program);
    if (!map) this.locations.set(program, (map = new Map()));
    if (!map.has(name)) map.set(name, this.gl.getUniformLocation(program, name));
    return map.get(name)!;
  }

  /** Waits until the GPU has finished the last draw (for timing). */
  finish(): void {
    const px = new Uint8Array(4);
    this.gl.readPixels(0, 0, 1, 1, this.gl.RGBA, this.gl.UNSIGNED_BYTE, px);
  }

  /** The canvas content as top-down RGBA. */
  readPixels(): Uint8Array {
    const gl = this.gl;
    const { width, height } = gl.canvas;
    const out = new Uint8Array(width * height * 4);
    gl.readPixels(0, 0, width, height, gl.RGBA, gl.UNSIGNED_BYTE, out);
    const flipped = new Uint8Array(out.length);
    const row = width * 4;
    for (let y = 0; y < height; y++) flipped.set(out.subarray((height - 1 - y) * row, (height - y) * row), y * row);
    return flipped;
  }
}
