import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { Pool } from 'pg';
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import { ApiRouter, type RouteSpec } from './core/api-router';
import { apiNotFound, errorHandler } from './core/error-handler';
import { publicAccess, useRoleLookup } from './core/policy';
import { roleIn } from './features/studios/membership-lookup';
import { refuseNul } from './core/refuse-nul';
import { securityHeaders } from './core/security-headers';
import { absoluteLifetime, csrfProtection, sessionMiddleware } from './core/session';
import './core/request-context';
import { activityRoutes } from './features/activity/activity.routes';
import { artworksRoutes } from './features/artworks/artworks.routes';
import { presetsRoutes, shareRoutes } from './features/presets/presets.routes';
import { PresetsService } from './features/presets/presets.service';
import { ArtworksService } from './features/artworks/artworks.service';
import { authRoutes } from './features/auth/auth.routes';
import { AuthService } from './features/auth/auth.service';
import { configurePassport } from './features/auth/passport';
import { SignInThrottle } from './features/auth/sign-in-throttle';
import { openApiDocument } from './features/docs/openapi';
import { healthRoutes } from './features/health/health.routes';
import { panelTypesRoutes } from './features/panel-types/panel-types.routes';
import { rendersRoutes } from './features/renders/renders.routes';
import { RenderEngine } from './render/render-engine';
import { RendersService } from './features/renders/renders.service';
import { RenderStore } from './storage/render-store';
import { romsRoutes } from './features/roms/roms.routes';
import { RomsService } from './features/roms/roms.service';
import { timingsRoutes } from './features/timings/timings.routes';
import { TimingsService } from './features/timings/timings.service';
import { inviteLinkRoutes, studiosRoutes } from './features/studios/studios.routes';
import { StudiosService } from './features/studios/studios.service';
import type { Mailer } from './mail/mailer';
import { MailOutbox } from './mail/outbox';
import { FileStore } from './storage/file-store';
import { createBlobStore, type BlobStore } from './storage/blob-store';
import { downloadRoutes, exportsRoutes, sharedExportRoutes } from './features/exports/exports.routes';
import { exportsService, type ExportsService } from './features/exports/exports.service';
import type { JobQueue } from './jobs/job-queue';
import { matchesRoutes } from './features/matches/matches.routes';
import { MatchesService } from './features/matches/matches.service';

/** What the app needs from outside: configuration and live connections. */
export interface AppDeps {
  config: Config;
  sequelize: Sequelize;
  /** pg pool for the session store. */
  sessionPool: Pool;
  mailer: Mailer;
  /** The render pool; one is made (and owned by the caller through app.renderEngine) when absent. */
  renderEngine?: RenderEngine;
  /** The background job queue (started by the caller). */
  jobs: JobQueue;
}

/** The Express app with every route; `listen` is the caller's business (server/main.ts, tests). */
export function createApp(deps: AppDeps): Express & {
  apiSpecs: RouteSpec[];
  artworks: ArtworksService;
  renders: RendersService;
  renderEngine: RenderEngine;
  exports: ExportsService;
  matches: MatchesService;
  blobs: BlobStore;
} {
  const { config, sequelize, mailer } = deps;
  // Studio routes read roles through the studios feature's cached lookup (core stays below features).
  useRoleLookup(roleIn);
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(securityHeaders);

  const health = healthRoutes(sequelize);
  app.use('/api/health', health.router);

  app.use(express.json({ limit: '256kb' }));
  app.use(refuseNul);
  app.use(cookieParser());
  app.use(sessionMiddleware(deps.sessionPool, config.sessionSecret, config.env === 'production'));
  const outbox = new MailOutbox(mailer, sequelize);
  const throttle = new SignInThrottle(sequelize);
  const auth = new AuthService(outbox, config.appUrl, sequelize, throttle);
  const passport = configurePassport(auth, throttle);
  app.use(passport.session());
  app.use(absoluteLifetime);
  app.use(csrfProtection);

  const renderEngine = deps.renderEngine ?? new RenderEngine();
  const blobs = createBlobStore(config);
  const renders = new RendersService(new RenderStore(blobs), renderEngine, sequelize, config.studioRenderBudgetBytes);
  const artworks = new ArtworksService(new FileStore(blobs), (bytes, sheet) => renderEngine.decodedFrames(bytes, sheet));
  const presets = new PresetsService(artworks);
  const exports = exportsService(config, blobs, artworks, renderEngine, deps.jobs);
  const matches = new MatchesService(blobs, renderEngine, deps.jobs, presets);
  const studios = new StudiosService(
    outbox,
    config.appUrl,
    (_studioId, artworkIds) => artworks.removeFiles(artworkIds),
    async (studioId) => {
      await renders.removeFor({ studioId });
      await exports.removeFor(studioId);
      await matches.removeFor(studioId);
    },
  );
  const timings = new TimingsService();
  const routers: ApiRouter[] = [
    health,
    authRoutes(auth, passport),
    studiosRoutes(studios),
    inviteLinkRoutes(studios),
    panelTypesRoutes(),
    rendersRoutes(renders),
    timingsRoutes(timings),
    romsRoutes(new RomsService(timings)),
    artworksRoutes(artworks, renders, presets),
    presetsRoutes(presets, config.appUrl, artworks, renders),
    shareRoutes(presets, artworks),
    exportsRoutes(exports, config.sessionSecret, config.appUrl),
    sharedExportRoutes(exports, config.sessionSecret),
    downloadRoutes(blobs, config.sessionSecret),
    matchesRoutes(matches),
    activityRoutes(),
  ];
  const docs = new ApiRouter('/docs', 'Service');
  const specs = routers.flatMap((r) => r.specs);
  docs.route('get', '/', { policy: publicAccess, summary: 'This OpenAPI document' }, (_req, res) => {
    res.json(openApiDocument([...specs, ...docs.specs]));
  });
  routers.push(docs);
  for (const r of routers.slice(1)) app.use(`/api${r.mount}`, r.router);
  app.use('/api', apiNotFound);

  serveSpa(app, config.staticDir);
  app.use(errorHandler);
  return Object.assign(app, { apiSpecs: routers.flatMap((r) => r.specs), artworks, renders, renderEngine, exports, matches, blobs });
}

/** Serves the built Angular app with a per-request CSP nonce in index.html. */
function serveSpa(app: Express, staticDir: string): void {
  const indexFile = path.resolve(staticDir, 'index.html');
  if (!existsSync(indexFile)) {
    app.get('/', (_req, res) => {
      res.type('text').send('The web app is not built yet: run `npm run build` (npm start does it for you).');
    });
    return;
  }
  const indexHtml = readFileSync(indexFile, 'utf8');
  app.use(express.static(path.resolve(staticDir), { index: false, maxAge: '1h', setHeaders: noCacheForHtml }));
  app.get('/{*splat}', (req, res) => {
    res.set('Cache-Control', 'no-store');
    // A share link's token must not leak to other sites through the Referer header.
    if (req.path.startsWith('/share/') || req.path.startsWith('/shared-exports/')) res.set('Referrer-Policy', 'no-referrer');
    res.type('html').send(indexHtml.replaceAll('__CSP_NONCE__', res.locals.cspNonce as string));
  });
}

function noCacheForHtml(res: express.Response, file: string): void {
  if (file.endsWith('.html')) res.set('Cache-Control', 'no-store');
}
