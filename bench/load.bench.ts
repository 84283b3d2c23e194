// `npm run -s bench:load`: read routes under load while uncached renders run (a benchmark, not a
// test). A real server process on loopback with its own database; autocannon, 50 connections,
// 10 s a route, bounded in time. Prints a table and, as the last line, one JSON object of figures.
import { mkdtempSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, DEMO_STUDIO_ID } from '../server/db/seed';
import { ApiSession, freshDatabase, startServer } from '../server/reliability/server-process';

// autocannon ships no types; the part used here.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const autocannon = require('autocannon') as (opts: object) => Promise<{
  latency: { p50: number; p99: number; max: number };
  requests: { average: number };
  non2xx: number;
  errors: number;
  timeouts: number;
}>;

const CONNECTIONS = 50;
const SECONDS = 10;
/** Uncached renders kept in flight the whole time. */
const RENDERS_IN_FLIGHT = Number(process.env.LOAD_RENDERS ?? 8);

async function main() {
  await freshDatabase('emberline_load');
  const server = await startServer({
    port: 4330,
    database: 'emberline_load',
    storageDir: mkdtempSync(path.join(os.tmpdir(), 'emberline-load-')),
    seed: true,
  });
  try {
    const owner = await ApiSession.signIn(server.url, DEMO_ACCOUNTS[0].email, DEMO_PASSWORD);
    const cookie = owner.cookieHeader();
    const artworks = (await (await owner.send('GET', `/api/studios/${DEMO_STUDIO_ID}/artworks`)).json()).artworks as {
      id: string;
      thumbnailUrl: string;
    }[];
    const routes: Record<string, { path: string; signedIn: boolean }> = {
      health: { path: '/api/health', signedIn: false },
      artworkList: { path: `/api/studios/${DEMO_STUDIO_ID}/artworks`, signedIn: true },
      presetList: { path: `/api/studios/${DEMO_STUDIO_ID}/presets`, signedIn: true },
      thumbnail: { path: artworks[0].thumbnailUrl, signedIn: true },
    };

    // Renders that are never cached: a new exposure each time, full 640 × 480 panel at scale 2.
    let rendering = true;
    let rendered = 0;
    let n = 0;
    const renderLoop = async () => {
      while (rendering) {
        const body = {
          artworkId: artworks[n % artworks.length].id,
          presetId: 'el-amber-640x480.standard',
          patch: { viewing: { exposureEv: (n++ % 4000) / 1000 } },
          scale: 2,
        };
        const res = await owner.send('POST', `/api/studios/${DEMO_STUDIO_ID}/renders`, body);
        await res.arrayBuffer();
        if (res.status === 201) rendered++;
      }
    };
    const loops = Array.from({ length: RENDERS_IN_FLIGHT }, renderLoop);
    await new Promise((r) => setTimeout(r, 1000));

    const figures: Record<string, { p50: number; p99: number; max: number; rps: number; non2xx: number }> = {};
    for (const [name, route] of Object.entries(routes)) {
      const result = await autocannon({
        url: `${server.url}${route.path}`,
        connections: CONNECTIONS,
        duration: SECONDS,
        headers: route.signedIn ? { cookie } : {},
      });
      figures[name] = {
        p50: result.latency.p50,
        p99: result.latency.p99,
        max: result.latency.max,
        rps: Math.round(result.requests.average),
        non2xx: result.non2xx + result.errors + result.timeouts,
      };
    }
    rendering = false;
    await Promise.all(loops);

    console.log(
      `${CONNECTIONS} connections, ${SECONDS} s a route, ${RENDERS_IN_FLIGHT} uncached 1280 × 960 renders in flight throughout (${rendered} finished); ${os.cpus().length} cores, ${process.version}`,
    );
    console.log('| route | p50 ms | p99 ms | max ms | requests/s | non-2xx |\n| --- | ---: | ---: | ---: | ---: | ---: |');
    for (const [name, f] of Object.entries(figures)) console.log(`| ${name} | ${f.p50} | ${f.p99} | ${f.max} | ${f.rps} | ${f.non2xx} |`);
    const routesJson = Object.fromEntries(Object.entries(figures).map(([k, f]) => [k, { p50: f.p50, p99: f.p99, non2xx: f.non2xx }]));
    const non2xx = Object.values(figures).reduce((s, f) => s + f.non2xx, 0);
    console.log(JSON.stringify({ routes: routesJson, non2xx, rendersFinished: rendered, serverPeakRssMb: Math.round(server.peakRssMb()) }));
  } finally {
    await server.kill();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
