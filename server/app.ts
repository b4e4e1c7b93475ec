import fs from 'node:fs';
import path from 'node:path';
import cors from 'cors';
import express, { type Express, type Request, type RequestHandler } from 'express';
import { pinoHttp } from 'pino-http';
import { acceptedBodyEncodings, boundedBodyDepth, loopbackHostOnly, noStore, rejectMalformedPath, securityHeaders, webNotFound } from './http/hardening';
import { apiNotFound, errorHandler, sameOriginGuard, sessionLoader, signedInBeforeBody } from './http/middleware';
import { authRequestLimiters, signInLimiters } from './http/rateLimits';
import { mount, type AnyRouteSpec } from './http/route';
import { createUploadGate, type UploadGate } from './http/upload';
import { versionSaveLimiter } from './http/versionSaveLimit';
import { activityRoutes } from './routes/activity';
import { adminRoutes } from './routes/admin';
import { authRoutes } from './routes/auth';
import { commentRoutes } from './routes/comments';
import { datasetRoutes } from './routes/datasets';
import { groupRoutes } from './routes/groups';
import { healthRoutes } from './routes/health';
import { liveRoutes } from './routes/live';
import { notebookRoutes } from './routes/notebooks';
import { openApiRoutes } from './routes/openapi';
import { runRoutes } from './routes/runs';
import { sharingRoutes } from './routes/sharing';
import { sharedLinkOpenLimiter } from './http/senderLimits';
import type { Services } from './services';

/**
 * Routes whose bodies may be larger than BODY_LIMIT. Their bodies are read only after the Origin check and
 * the session: nobody signed out (or from another site) makes the server buffer or parse megabytes.
 */
const LARGE_BODY_ROUTES: { path: string; pattern: RegExp; parser(config: Services['config']): RequestHandler }[] = [
  // the exchange file is read as text and parsed and checked in the document pool, not on the request thread
  { path: '/notebooks/import', pattern: /^\/notebooks\/import\/?$/i, parser: (config) => express.text({ type: 'application/json', limit: config.importBodyLimit }) },
  { path: '/notebooks/:notebookId/datasets/pasted', pattern: /^\/notebooks\/[^/]+\/datasets\/pasted\/?$/i, parser: (config) => express.json({ limit: config.pastedBodyLimit }) },
  { path: '/calc', pattern: /^\/calc\/?$/i, parser: (config) => express.json({ limit: config.calcBodyLimit }) },
];

const isLargeBodyRoute = (req: Request) => req.method === 'POST' && LARGE_BODY_ROUTES.some((route) => route.pattern.test(req.path));

/** BODY_LIMIT for every JSON body but those of LARGE_BODY_ROUTES, which are left unread here. */
function smallJsonBodies(limit: string): RequestHandler {
  const parse = express.json({ limit });
  return (req, res, next) => (isLargeBodyRoute(req) ? next() : parse(req, res, next));
}

/** Every API route, in mounting order: the single table the router, the OpenAPI document and the access-matrix test read. */
export function apiRouteTable(services: Services): AnyRouteSpec[] {
  const specs = [
    ...healthRoutes(services),
    ...authRoutes(services),
    ...groupRoutes(services),
    ...notebookRoutes(services),
    ...datasetRoutes(services),
    ...runRoutes(services),
    ...liveRoutes(services),
    ...sharingRoutes(services),
    ...commentRoutes(services),
    ...activityRoutes(services),
    ...adminRoutes(services),
  ];
  return [...specs, ...openApiRoutes(() => specs)];
}

function apiRouter(services: Services, uploads: UploadGate) {
  const router = express.Router();
  const { publicUrl, extraAppOrigins } = services.config;
  router.use(noStore);
  if (extraAppOrigins.length) router.use(cors({ origin: extraAppOrigins, credentials: true }));
  router.use(acceptedBodyEncodings);
  router.use(smallJsonBodies(services.config.bodyLimit));
  router.use(boundedBodyDepth);
  router.use(sameOriginGuard([publicUrl, ...extraAppOrigins], services.sessions.cookieName));
  const authLimits = authRequestLimiters(services.config.authLimits);
  router.post('/auth/sign-in', ...signInLimiters(services.config.signInLimits, services.knownDevices));
  router.post('/auth/sign-up', authLimits.signUp);
  router.post('/auth/forgot', authLimits.forgot);
  router.post('/auth/reset', authLimits.reset);
  router.post('/auth/verify', authLimits.verify);
  router.use('/shared', sharedLinkOpenLimiter(services.config.authLimits.sharedLinkOpensPerIpPer15Min));
  router.use(sessionLoader(services.sessions));
  for (const route of LARGE_BODY_ROUTES) router.post(route.path, signedInBeforeBody, route.parser(services.config), boundedBodyDepth);
  router.post('/auth/verify/resend', authLimits.resendVerification);
  router.post('/groups/:groupId/members', authLimits.groupAdds);
  router.post('/notebooks/:notebookId/versions', versionSaveLimiter(services.config.authLimits.versionSavesPerUserPerHour));
  mount(router, apiRouteTable(services), uploads);
  router.use(apiNotFound);
  return router;
}

/** Serve the exported web app: real files as they are, missing files as 404, app paths as index.html. */
function webApp(webRoot: string) {
  const router = express.Router();
  const indexFile = path.join(webRoot, 'index.html');
  router.use(express.static(webRoot, { index: false, fallthrough: true, maxAge: '1h' }));
  router.get('/{*splat}', (req, res) => {
    if (path.extname(req.path)) return res.status(404).type('text/plain').send('Not found');
    if (!fs.existsSync(indexFile)) {
      return res.status(503).type('text/plain').send('The web app is not built yet: run `npm run build:web`.');
    }
    res.sendFile(indexFile);
  });
  return router;
}

export function createApp(services: Services): Express {
  const app = express();
  app.disable('x-powered-by');
  // Replies are small and rarely repeated byte for byte; hashing every body for an ETag costs more than it saves.
  app.set('etag', false);
  app.set('trust proxy', services.config.trustProxy);
  app.use(
    pinoHttp({
      logger: services.logger,
      customLogLevel: (_req, res, error) => (error || res.statusCode >= 500 ? 'error' : 'info'),
      serializers: { req: (req) => ({ method: req.method, url: req.url }), res: (res) => ({ status: res.statusCode }) },
    }),
  );
  app.use(securityHeaders(services.config.publicUrl));
  app.use(rejectMalformedPath);
  if (services.config.localOnly) app.use(loopbackHostOnly);
  const uploads = createUploadGate(services.config.uploadsInFlight);
  // how many uploads are being read, for operators (and tests) to look at
  app.locals.uploads = uploads;
  app.use('/api', apiRouter(services, uploads));
  app.use(webApp(services.config.webRoot));
  app.use(webNotFound);
  app.use(errorHandler(services.logger));
  return app;
}
