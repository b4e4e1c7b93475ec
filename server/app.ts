import fs from 'node:fs';
import path from 'node:path';
import cors from 'cors';
import express, { type Express } from 'express';
import { pinoHttp } from 'pino-http';
import { acceptedBodyEncodings, boundedBodyDepth, loopbackHostOnly, noStore, rejectMalformedPath, securityHeaders, webNotFound } from './http/hardening';
import { apiNotFound, errorHandler, sameOriginGuard, sessionLoader } from './http/middleware';
import { authRequestLimiters, signInLimiters } from './http/rateLimits';
import { mount, type AnyRouteSpec } from './http/route';
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

/** Largest exchange file POST /notebooks/import accepts (other JSON bodies: BODY_LIMIT). */
export const IMPORT_BODY_LIMIT = '12mb';
/** A pasted table may hold DATASET_LIMITS.maxPastedChars characters, up to 4 bytes each in UTF-8 plus JSON escapes. */
export const PASTED_TABLE_BODY_LIMIT = '1mb';

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

function apiRouter(services: Services) {
  const router = express.Router();
  const { publicUrl, extraAppOrigins } = services.config;
  router.use(noStore);
  if (extraAppOrigins.length) router.use(cors({ origin: extraAppOrigins, credentials: true }));
  router.use(acceptedBodyEncodings);
  // an exchange file carries its datasets' points (a 200 000-row table is several MB): only the import route takes that much
  router.post('/notebooks/import', express.json({ limit: IMPORT_BODY_LIMIT }));
  router.post('/notebooks/:notebookId/datasets/pasted', express.json({ limit: PASTED_TABLE_BODY_LIMIT }));
  router.use(express.json({ limit: services.config.bodyLimit }));
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
  router.post('/auth/verify/resend', authLimits.resendVerification);
  router.post('/groups/:groupId/members', authLimits.groupAdds);
  router.post('/notebooks/:notebookId/versions', versionSaveLimiter(services.config.authLimits.versionSavesPerUserPerHour));
  mount(router, apiRouteTable(services));
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
  app.use('/api', apiRouter(services));
  app.use(webApp(services.config.webRoot));
  app.use(webNotFound);
  app.use(errorHandler(services.logger));
  return app;
}
