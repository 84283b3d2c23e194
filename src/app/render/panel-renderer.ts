import type { OutputUniforms } from '../../../shared/pipeline/output/uniforms';
import type { Field } from '../../../shared/pipeline/types';
import { FULLSCREEN_VERTEX, PANEL_FRAGMENT, PASSTHROUGH_FRAGMENT } from './output.glsl';

function compile(gl: WebGL2RenderingContext, vertex: string, fragment: string): WebGLProgram {
  const program = gl.createProgram()!;
  for (const [type, source] of [[gl.VERTEX_SHADER, vertex], [gl.FRAGMENT_SHADER, fragment]] as const) {
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
 * texelFetch, one full-screen pass of the panel shader into the canvas.
 */
export class PanelRenderer {
  private readonly program: WebGLProgram;
  private passthrough?: WebGLProgram;
  private readonly emissionTex: WebGLTexture;
  private readonly glowTex: WebGLTexture;
  private imageTex?: WebGLTexture;
  private grid = [0, 0];
  private glowSize = [0, 0];

  /** A renderer, or null when the browser has no WebGL2 (the caller falls back to the CPU). */
  static create(canvas: HTMLCanvasElement | OffscreenCanvas): PanelRenderer | null {
    const gl = canvas.getContext('webgl2', { antialias: false, preserveDrawingBuffer: true, premultipliedAlpha: false, alpha: false }) as WebGL2RenderingContext | null;
    return gl ? new PanelRenderer(gl) : null;
  }

  private constructor(readonly gl: WebGL2RenderingContext) {
    this.program = compile(gl, FULLSCREEN_VERTEX, PANEL_FRAGMENT);
    const buffer = gl.createBuffer();
    gl.bindBuffer(gl.ARRAY_BUFFER, buffer);
    gl.bufferData(gl.ARRAY_BUFFER, new Float32Array([-1, -1, 3, -1, -1, 3]), gl.STATIC_DRAW);
    gl.enableVertexAttribArray(0);
    gl.vertexAttribPointer(0, 2, gl.FLOAT, false, 0, 0);
    this.emissionTex = this.floatTexture();
    this.glowTex = this.floatTexture();
  }

  private floatTexture(): WebGLTexture {
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
    gl.useProgram(this.program);
    const p = this.program;
    const loc = (name: string) => gl.getUniformLocation(p, name);
    gl.activeTexture(gl.TEXTURE0);
    gl.bindTexture(gl.TEXTURE_2D, this.emissionTex);
    gl.uniform1i(loc('emission'), 0);
    gl.activeTexture(gl.TEXTURE1);
    gl.bindTexture(gl.TEXTURE_2D, this.glowTex);
    gl.uniform1i(loc('glow'), 1);
    gl.uniform2i(loc('grid'), this.grid[0], this.grid[1]);
    gl.uniform2i(loc('glowSize'), this.glowSize[0], this.glowSize[1]);
    gl.uniform2f(loc('outputSize'), u.width, u.height);
    gl.uniform2f(loc('cellSize'), u.cellW, u.cellH);
    gl.uniform2f(loc('fill'), u.fillX, u.fillY);
    gl.uniform1i(loc('crt'), u.crt ? 1 : 0);
    gl.uniform1f(loc('spotSigma'), u.spotSigmaPx);
    gl.uniform1i(loc('lineReach'), Math.min(16, Math.ceil((4 * u.spotSigmaPx + 1) / u.cellH) + 1));
    gl.uniform1f(loc('directShare'), u.directShare);
    gl.uniform1f(loc('glowOversample'), u.glowOversample);
    gl.uniform3f(loc('colour'), u.colour[0], u.colour[1], u.colour[2]);
    gl.uniform1f(loc('ambient'), u.colourY * u.ambientCdM2);
    gl.uniform1f(loc('peak'), u.peakCdM2);
    gl.uniform1f(loc('offLevel'), u.offCdM2);
    gl.uniform1f(loc('gain'), u.gain);
    gl.uniform1f(loc('knee'), u.knee);
    gl.drawArrays(gl.TRIANGLES, 0, 3);
  }

  /** A plain textured draw of an RGBA image of this size (benchmark baseline). */
  drawImage(data: Uint8Array, width: number, height: number): void {
    const gl = this.gl;
    this.passthrough ??= compile(gl, FULLSCREEN_VERTEX, PASSTHROUGH_FRAGMENT);
    this.imageTex ??= this.floatTexture();
    gl.canvas.width = width;
    gl.canvas.height = height;
    gl.viewport(0, 0, width, height);
    gl.useProgram(this.passthrough);
    gl.activeTexture(gl.TEXTURE0);
    gl.bindTexture(gl.TEXTURE_2D, this.imageTex);
    gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA8, width, height, 0, gl.RGBA, gl.UNSIGNED_BYTE, data);
    gl.uniform1i(gl.getUniformLocation(this.passthrough, 'image'), 0);
    gl.uniform2f(gl.getUniformLocation(this.passthrough, 'outputSize'), width, height);
    gl.drawArrays(gl.TRIANGLES, 0, 3);
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
