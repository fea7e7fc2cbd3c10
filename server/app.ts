import fs from 'node:fs';
import type { ApiError as ApiErrorReply } from '../shared/schemas/common.js';
import path from 'node:path';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { Sequelize } from 'sequelize';
import type { Config } from './config.js';
import { Api } from './http/api.js';
import { makeLimits } from './http/limits.js';
import { authenticate } from './middleware/authenticate.js';
import { authenticateTablet } from './middleware/tablet.js';
import { sameOriginJson } from './middleware/same-origin.js';
import { errorHandler } from './middleware/errors.js';
import { requestId } from './middleware/request-id.js';
import { accountRoutes } from './routes/account.js';
import { attachmentRoutes } from './routes/attachments.js';
import { setAppUrl } from './mail/links.js';
import { ncrRoutes } from './routes/ncrs.js';
import { primaryOnly, type ReadSide } from './read-side.js';
import { buildRoutes } from './routes/build.js';
import { releaseRoutes } from './routes/release.js';
import { runTestRoutes } from './routes/run-test.js';
import { trailRoutes } from './routes/trail.js';
import { fieldActionRoutes } from './routes/field-actions.js';
import { warrantyRoutes } from './routes/warranty.js';
import { correctiveActionRoutes } from './routes/corrective-actions.js';
import { gaugeRoutes } from './routes/gauges.js';
import { lineRoutes } from './routes/line.js';
import { plantRoutes } from './routes/plant.js';
import { mailRoutes } from './routes/mail.js';
import { specRoutes } from './routes/spec.js';
import { spcRoutes } from './routes/spc.js';
import { stationRoutes } from './routes/station.js';
import { tabletRoutes } from './routes/tablets.js';
import { qualificationRoutes } from './routes/qualifications.js';
import { unitPreferenceRoutes } from './routes/unit-preferences.js';
import { receivingRoutes } from './routes/receiving.js';
import { auditRoutes } from './routes/audit.js';
import { coreRoutes } from './routes/cores.js';
import { itemRoutes } from './routes/items.js';
import { partyRoutes } from './routes/parties.js';
import { authRoutes } from './routes/auth.js';
import { healthRoutes } from './routes/health.js';
import { peopleRoutes } from './routes/people.js';
import { referenceRoutes } from './routes/reference.js';
import { processRoutes } from './routes/process.js';
import { setBcryptCost } from './services/passwords.js';
import { LocalDiskStore, type BlobStore } from './storage/blob-store.js';

export type AppState = { draining: boolean };

/** Builds the Express app without listening, so tests drive it in-process with supertest. */
export function createApp({
  sequelize,
  config,
  store = new LocalDiskStore(config.UPLOAD_DIR),
  read = primaryOnly(sequelize),
}: {
  sequelize: Sequelize;
  config: Config;
  store?: BlobStore;
  /** where read-only pages read: a hot standby (DATABASE_READ_URL), else the primary */
  read?: ReadSide;
}): Express & { apiRoutes: Api['routes']; state: AppState } {
  setBcryptCost(config.BCRYPT_COST);
  setAppUrl(config.APP_URL ?? `http://${config.HOST}:${config.PORT}`);
  const app = express();
  const state: AppState = { draining: false };
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.set('query parser', 'simple');

  app.use(requestId);
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: false,
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          fontSrc: ["'self'"],
          connectSrc: ["'self'"],
          mediaSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          baseUri: ["'self'"],
          formAction: ["'self'"],
          frameAncestors: ["'none'"],
        },
      },
      strictTransportSecurity: false,
    }),
  );
  app.use((req, res, next) => {
    // while shutting down, requests already running finish; new ones are told to come back
    if (state.draining) {
      res.setHeader('Connection', 'close');
      res.status(503).json({
        error: {
          code: 'shutting_down',
          message: 'The server is restarting. Try again in a moment.',
          requestId: req.id,
        },
      } satisfies ApiErrorReply);
      return;
    }
    next();
  });

  const router = express.Router();
  const api = new Api(router, makeLimits(config));
  router.use((_req, res, next) => {
    // API replies name people, parts and decisions: never kept by a browser or a proxy
    res.setHeader('Cache-Control', 'no-store');
    next();
  });
  router.use(sameOriginJson({ appUrl: config.APP_URL, takesFile: api.takesFile }));
  router.use(express.json({ limit: '256kb', strict: true }));
  router.use(cookieParser());
  router.use(authenticate(config.JWT_SECRET, { idleMin: config.IDLE_TIMEOUT_MIN, shiftHours: config.SHIFT_HOURS }));
  router.use(authenticateTablet(config.JWT_SECRET));
  healthRoutes(api, sequelize);
  authRoutes(api, sequelize, config);
  accountRoutes(api, sequelize, config);
  peopleRoutes(api, sequelize);
  referenceRoutes(api, sequelize);
  processRoutes(api, sequelize);
  auditRoutes(api, sequelize, config);
  partyRoutes(api, sequelize);
  coreRoutes(api, sequelize);
  itemRoutes(api, sequelize);
  attachmentRoutes(api, sequelize, store, config);
  stationRoutes(api, sequelize);
  unitPreferenceRoutes(api, sequelize);
  qualificationRoutes(api, sequelize);
  tabletRoutes(api, sequelize, config);
  receivingRoutes(api, sequelize);
  specRoutes(api, sequelize);
  spcRoutes(api, sequelize);
  ncrRoutes(api, sequelize);
  buildRoutes(api, sequelize);
  releaseRoutes(api, sequelize, config);
  trailRoutes(api, sequelize, read);
  runTestRoutes(api);
  fieldActionRoutes(api, sequelize);
  warrantyRoutes(api, sequelize);
  correctiveActionRoutes(api, sequelize);
  gaugeRoutes(api, sequelize);
  lineRoutes(api, sequelize, read);
  plantRoutes(api, sequelize);
  mailRoutes(api, config);
  router.use((req, res) => {
    res.status(404).json({
      error: {
        code: 'not_found',
        message: `No API route ${req.method} ${req.baseUrl}${req.path}.`,
        requestId: req.id,
      },
    } satisfies ApiErrorReply);
  });
  router.use(errorHandler);
  app.use('/api', router);

  // resolved here, so a relative CLIENT_DIR in the environment serves as well as an absolute one
  const clientDir = config.CLIENT_DIR && path.resolve(config.CLIENT_DIR);
  if (clientDir && fs.existsSync(path.join(clientDir, 'index.html'))) {
    // the client's files only: /api replies end in the router above, so none is compressed here
    app.use(compression());
    app.use(express.static(clientDir, { index: false, maxAge: '1h', immutable: false }));
    app.get(/^\/(?!api\/).*/, (_req, res) => {
      // no-store also keeps the browser's back button from showing a page from before sign-out
      res.setHeader('Cache-Control', 'no-store');
      // relative to its root: send refuses any path with a dot-folder in it (a build under .bench/)
      res.sendFile('index.html', { root: clientDir });
    });
  }
  app.use(errorHandler);
  return Object.assign(app, { apiRoutes: api.routes, state });
}
