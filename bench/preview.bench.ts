// `npm run bench:preview`: the bench's redraw in headless Chromium (a benchmark, not a test).
// Starts its own server (database, mail catcher, port 4310 as the browser tests do), opens a
// 640 × 480 panel at scale 2, changes a parameter ≥ 30 times and reads the page's own
// "emberline-redraw" User Timing entries (edit → finished frame, GPU included). In the same page
// it times a plain textured draw of the same output size. Prints a table, then one JSON line.
import { chromium } from '@playwright/test';
import { spawn } from 'node:child_process';
import { pngOf } from '../server/testing/images';
import { median } from './timing';
import { CHROMIUM } from '../e2e/chromium';

const PORT = 4310;
const BASE = `http://127.0.0.1:${PORT}`;
const REDRAWS = 40;

async function waitForHealth(): Promise<void> {
  const deadline = Date.now() + 120_000;
  while (Date.now() < deadline) {
    try {
      if ((await fetch(`${BASE}/api/health`)).ok) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error('the server did not start within 2 minutes');
}

async function main() {
  const server = spawn('node', ['scripts/e2e-server.mjs'], { stdio: ['ignore', 'ignore', 'inherit'], detached: true });
  const browser = await chromium.launch(CHROMIUM);
  try {
    await waitForHealth();
    const page = await browser.newPage({ viewport: { width: 1600, height: 1200 } });
    await page.goto(`${BASE}/sign-in`);
    await page.getByLabel('E-mail').fill('editor@kilnquartz.example');
    await page.getByLabel('Password').fill('amber-glow-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/bench/);
    const studioId = page.url().match(/studios\/([0-9a-f-]{36})/)![1];
    const xsrf = (await page.context().cookies()).find((c) => c.name === 'XSRF-TOKEN')!.value;
    const art = pngOf(640, 480, (x, y) => {
      const v = y < 240 ? Math.round((x / 639) * 255) : ((x >> 4) + (y >> 4)) % 2 ? 255 : 0;
      return [v, v, v, 255];
    });
    const res = await page.request.post(`${BASE}/api/studios/${studioId}/artworks`, {
      headers: { 'X-XSRF-TOKEN': xsrf },
      multipart: { name: 'bench card', file: { name: 'card.png', mimeType: 'image/png', buffer: art } },
    });
    const { artwork } = await res.json();
    await page.goto(`${BASE}/studios/${studioId}/bench?artwork=${artwork.id}`);
    const stage = page.getByTestId('stage');
    const draws = async () => Number(await stage.getAttribute('data-draws'));
    const waitDraw = async (before: number) => {
      for (let i = 0; i < 3000 && (await draws()) <= before; i++) await page.waitForTimeout(5);
    };
    await waitDraw(0);
    const measures = () => page.evaluate(() => performance.getEntriesByName('emberline-redraw').map((e) => e.duration));
    const edit = async (label: string, value: number) => {
      const before = await draws();
      const input = page.getByRole('spinbutton', { name: label });
      await input.fill(String(value));
      await input.press('Enter');
      await waitDraw(before);
    };
    await page.getByRole('button', { name: 'Viewing' }).click();
    const outputTimes: number[] = [];
    for (let i = 0; i < REDRAWS; i++) {
      const n = (await measures()).length;
      await edit('Exposure', ((i % 8) - 4) / 4);
      outputTimes.push((await measures())[n]);
    }
    const panelTimes: number[] = [];
    for (let i = 0; i < 10; i++) {
      const n = (await measures()).length;
      await edit('Glow radius', 0.2 + i * 0.1);
      panelTimes.push((await measures())[n]);
    }
    const { width, height } = await page
      .getByTestId('live-canvas')
      .evaluate((c: HTMLCanvasElement) => ({ width: c.width, height: c.height }));
    // Baseline: upload an RGBA image of the output size and draw it as a textured full-screen pass.
    const passthrough = await page.evaluate(
      ({ width, height, runs }) => {
        const canvas = document.createElement('canvas');
        canvas.width = width;
        canvas.height = height;
        const gl = canvas.getContext('webgl2', { antialias: false, preserveDrawingBuffer: true })!;
        const vs = `#version 300 es\nin vec2 p; void main(){ gl_Position = vec4(p, 0.0, 1.0); }`;
        const fs = `#version 300 es\nprecision highp float; uniform sampler2D t; uniform vec2 s; out vec4 o; void main(){ o = texelFetch(t, ivec2(int(gl_FragCoord.x), int(s.y - 1.0 - floor(gl_FragCoord.y))), 0); }`;
        const prog = gl.createProgram()!;
        for (const [type, src] of [
          [gl.VERTEX_SHADER, vs],
          [gl.FRAGMENT_SHADER, fs],
        ] as const) {
          const sh = gl.createShader(type)!;
          gl.shaderSource(sh, src);
          gl.compileShader(sh);
          gl.attachShader(prog, sh);
        }
        gl.bindAttribLocation(prog, 0, 'p');
        gl.linkProgram(prog);
        gl.useProgram(prog);
        const buf = gl.createBuffer();
        gl.bindBuffer(gl.ARRAY_BUFFER, buf);
        gl.bufferData(gl.ARRAY_BUFFER, new Float32Array([-1, -1, 3, -1, -1, 3]), gl.STATIC_DRAW);
        gl.enableVertexAttribArray(0);
        gl.vertexAttribPointer(0, 2, gl.FLOAT, false, 0, 0);
        const tex = gl.createTexture();
        gl.bindTexture(gl.TEXTURE_2D, tex);
        gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MIN_FILTER, gl.NEAREST);
        gl.texParameteri(gl.TEXTURE_2D, gl.TEXTURE_MAG_FILTER, gl.NEAREST);
        const pixels = new Uint8Array(width * height * 4).map((_, i) => (i * 31) & 255);
        gl.uniform2f(gl.getUniformLocation(prog, 's'), width, height);
        const px = new Uint8Array(4);
        const times: number[] = [];
        for (let i = 0; i < runs + 1; i++) {
          const t = performance.now();
          gl.texImage2D(gl.TEXTURE_2D, 0, gl.RGBA8, width, height, 0, gl.RGBA, gl.UNSIGNED_BYTE, pixels);
          gl.drawArrays(gl.TRIANGLES, 0, 3);
          gl.readPixels(0, 0, 1, 1, gl.RGBA, gl.UNSIGNED_BYTE, px);
          if (i > 0) times.push(performance.now() - t);
        }
        return times;
      },
      { width, height, runs: REDRAWS },
    );
    const redrawMs = median(outputTimes);
    const passthroughMs = median(passthrough);
    const panelRedrawMs = median(panelTimes);
    console.log(`headless Chromium (${browser.version()}), output ${width} × ${height}, ${REDRAWS} redraws`);
    console.log('| step | median ms |\n| --- | ---: |');
    console.log(`| edit an output-stage parameter (exposure) → finished frame | ${redrawMs.toFixed(2)} |`);
    console.log(`| edit a panel-stage parameter (glow radius) → finished frame, worker included | ${panelRedrawMs.toFixed(2)} |`);
    console.log(`| plain textured draw of the same size (upload + draw + finish) | ${passthroughMs.toFixed(2)} |`);
    console.log(
      JSON.stringify({
        redrawMs: +redrawMs.toFixed(2),
        passthroughMs: +passthroughMs.toFixed(2),
        ratio: +(redrawMs / passthroughMs).toFixed(3),
        panelRedrawMs: +panelRedrawMs.toFixed(1),
        width,
        height,
        redraws: REDRAWS,
      }),
    );
  } finally {
    await browser.close();
    process.kill(-server.pid!, 'SIGTERM');
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
