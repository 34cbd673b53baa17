/**
 * createApp(deps): the whole HTTP application — security headers, request log, body parsing, CSRF,
 * sessions, the feature routers, the /api 404, the client, one error handler. It never listens:
 * server/index.ts (and the tests) put it on a port.
 */
import express, { type Express, type RequestHandler } from 'express';
import type pg from 'pg';
import type { Db } from './db/client';
import auditRouter from './features/audit/audit.router';
import attachmentsRouter from './features/attachments/attachments.router';
import { createAttachmentsRepository } from './features/attachments/attachments.repository';
import { createAttachmentsService } from './features/attachments/attachments.service';
import { createRepeatsService } from './features/sync/repeats.service';
import syncRouter from './features/sync/sync.router';
import { createSyncRepository } from './features/sync/sync.repository';
import { createSyncService } from './features/sync/sync.service';
import { createAuditRepository } from './features/audit/audit.repository';
import { createAuditService } from './features/audit/audit.service';
import authRouter from './features/auth/auth.router';
import { createAuthRepository } from './features/auth/auth.repository';
import { createAuthService } from './features/auth/auth.service';
import devMailRouter from './features/dev-mail/dev-mail.router';
import healthRouter from './features/health/health.router';
import { createHealthRepository } from './features/health/health.repository';
import { createHealthService } from './features/health/health.service';
import invitationsRouter from './features/invitations/invitations.router';
import { createInvitationsRepository } from './features/invitations/invitations.repository';
import { createInvitationsService } from './features/invitations/invitations.service';
import membersRouter from './features/members/members.router';
import { createMembersRepository } from './features/members/members.repository';
import { createMembersService } from './features/members/members.service';
import sitesRouter from './features/sites/sites.router';
import { createSitesRepository } from './features/sites/sites.repository';
import { createSitesService } from './features/sites/sites.service';
import offlineRouter from './features/offline/offline.router';
import { createOfflineRepository } from './features/offline/offline.repository';
import { createOfflineService } from './features/offline/offline.service';
import surveysRouter from './features/surveys/surveys.router';
import emittersRouter from './features/emitters/emitters.router';
import { createEmittersRepository } from './features/emitters/emitters.repository';
import { createEmittersService } from './features/emitters/emitters.service';
import instrumentsRouter from './features/instruments/instruments.router';
import { createInstrumentsRepository } from './features/instruments/instruments.repository';
import { createInstrumentsService } from './features/instruments/instruments.service';
import plansRouter from './features/plans/plans.router';
import { createPlansRepository } from './features/plans/plans.repository';
import { createPlansService } from './features/plans/plans.service';
import roomsRouter from './features/rooms/rooms.router';
import { createRoomsRepository } from './features/rooms/rooms.repository';
import { createRoomsService } from './features/rooms/rooms.service';
import sourcesRouter from './features/sources/sources.router';
import emcRouter from './features/emc/emc.router';
import { createEmcRepository } from './features/emc/emc.repository';
import { createEmcService } from './features/emc/emc.service';
import watchBandsRouter from './features/watch-bands/watch-bands.router';
import { createWatchBandsRepository } from './features/watch-bands/watch-bands.repository';
import { createWatchBandsService } from './features/watch-bands/watch-bands.service';
import emcSweepsRouter from './features/emc-sweeps/emc-sweeps.router';
import { createEmcSweepsRepository } from './features/emc-sweeps/emc-sweeps.repository';
import { createEmcSweepsService } from './features/emc-sweeps/emc-sweeps.service';
import { createSourcesRepository } from './features/sources/sources.repository';
import { createSourcesService } from './features/sources/sources.service';
import surveySetupRouter from './features/survey-setup/survey-setup.router';
import reviewRouter from './features/review/review.router';
import { createReadingsCsv } from './features/review/readings-csv';
import { createReviewRepository } from './features/review/review.repository';
import { createReviewService } from './features/review/review.service';
import surveyMapRouter from './features/survey-map/survey-map.router';
import { createSurveyMapRepository } from './features/survey-map/survey-map.repository';
import { createSurveyMapService } from './features/survey-map/survey-map.service';
import { createSurveySetupRepository } from './features/survey-setup/survey-setup.repository';
import { createSurveySetupService } from './features/survey-setup/survey-setup.service';
import { createSurveysRepository } from './features/surveys/surveys.repository';
import { createSurveysService } from './features/surveys/surveys.service';
import { isHttps } from './lib/config';
import type { Logger } from './lib/logger';
import type { Mailer } from './lib/mail';
import type { MailCapture } from './lib/mail-capture';
import { serveClient } from './lib/static-client';
import { unavailableStorage, type Storage } from './lib/storage';
import { createAuthGuards } from './middleware/auth';
import { csrfOriginCheck } from './middleware/csrf';
import { apiNotFound, errorHandler } from './middleware/error-handler';
import { createRateLimiters, DEFAULT_RATE_LIMITS, type RateLimits } from './middleware/rate-limit';
import { requestLogger } from './middleware/request-logger';
import { securityHeaders } from './middleware/security-headers';
import { createSessionMiddleware } from './middleware/session';

/** Largest JSON body accepted; bigger ones get 413 PAYLOAD_TOO_LARGE. Uploads use their own routes. */
export const JSON_BODY_LIMIT = '1mb';

export interface AppDeps {
  db: Db;
  pool: pg.Pool;
  logger: Logger;
  mailer: Mailer;
  /** The local SMTP capture, when it runs (dev, tests): enables GET /api/dev/mail. */
  mailCapture?: MailCapture | null;
  /** The object store (plans, antenna-factor tables); without it, file routes answer 503. */
  storage?: Storage;
  /** Origin people use; links in e-mails point here; https here makes cookies Secure. */
  publicUrl: string;
  /** Origins allowed to make unsafe requests (always includes publicUrl's). */
  trustedOrigins: string[];
  sessionSecret: string;
  trustProxy?: string | undefined;
  rateLimits?: Partial<RateLimits>;
  /** The client: a built folder (npm start) or Vite's dev middleware (npm run dev). */
  client?: { dir: string } | { middleware: RequestHandler };
}

export interface FringewalkApp {
  app: Express;
  /** Stops the session store's timer; the pool belongs to the caller. */
  close(): Promise<void>;
}

function parseTrustProxy(value: string | undefined): boolean | number | string {
  if (value === undefined || value === '' || value === 'false') return false;
  if (value === 'true') return true;
  return /^\d+$/.test(value) ? Number(value) : value;
}

export function createApp(deps: AppDeps): FringewalkApp {
  const https = isHttps(deps.publicUrl);
  const devMode = Boolean(deps.client && 'middleware' in deps.client);
  const trustedOrigins = [...new Set([new URL(deps.publicUrl).origin, ...deps.trustedOrigins])];

  const authService = createAuthService({ repo: createAuthRepository(deps.db), mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger });
  const guards = createAuthGuards(authService);
  const limiters = createRateLimiters({ ...DEFAULT_RATE_LIMITS, ...deps.rateLimits });
  const session = createSessionMiddleware({ pool: deps.pool, secret: deps.sessionSecret, secure: https });

  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', parseTrustProxy(deps.trustProxy));
  app.use(securityHeaders({ https, devMode }));
  app.use(requestLogger(deps.logger));

  const api = express.Router();
  // API answers are per user and change with every sync: no browser or proxy may keep them (a cached
  // pull page handed one device another's stale changes). A route that is safe to cache (plan images,
  // with their ETag) sets its own Cache-Control after this.
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  api.use(healthRouter({ health: createHealthService(createHealthRepository(deps.db)) }));
  // The Origin check comes before body parsing: a forged request is refused without reading it.
  api.use(csrfOriginCheck(trustedOrigins));
  api.use(express.json({ limit: JSON_BODY_LIMIT }));
  api.use(session.middleware);
  api.use('/auth', authRouter({ auth: authService, guards, limiters, cookieOptions: session.cookieOptions }));
  api.use(
    invitationsRouter({
      invitations: createInvitationsService({ repo: createInvitationsRepository(deps.db), auth: authService, mailer: deps.mailer, publicUrl: deps.publicUrl }),
      auth: authService,
      guards,
    }),
  );
  api.use(membersRouter({ members: createMembersService(createMembersRepository(deps.db)), guards }));
  api.use(sitesRouter({ sites: createSitesService(createSitesRepository(deps.db)), guards }));
  api.use(surveysRouter({ surveys: createSurveysService(createSurveysRepository(deps.db)), guards }));
  api.use(offlineRouter({ offline: createOfflineService(createOfflineRepository(deps.db)), guards }));
  // Site setup (issue 6): plans, rooms, magnets, emitters, instruments, survey planning.
  const storage = deps.storage ?? unavailableStorage();
  api.use(plansRouter({ plans: createPlansService({ repo: createPlansRepository(deps.db), storage, logger: deps.logger }), guards }));
  api.use(roomsRouter({ rooms: createRoomsService(createRoomsRepository(deps.db)), guards }));
  api.use(sourcesRouter({ sources: createSourcesService(createSourcesRepository(deps.db)), guards }));
  api.use(emittersRouter({ emitters: createEmittersService(createEmittersRepository(deps.db)), guards }));
  // EMC (issue 8): watch bands.
  api.use(watchBandsRouter({ watchBands: createWatchBandsService(createWatchBandsRepository(deps.db)), guards }));
  // EMC (issue 8): predicted lines per room and their flags (computed by the flag job, emc-flag-job.ts).
  api.use(emcRouter({ emc: createEmcService({ repo: createEmcRepository(deps.db), mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger }), guards }));
  api.use(
    instrumentsRouter({
      instruments: createInstrumentsService({ repo: createInstrumentsRepository(deps.db), storage, mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger }),
      guards,
    }),
  );
  api.use(
    surveySetupRouter({
      surveySetup: createSurveySetupService({ repo: createSurveySetupRepository(deps.db), mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger }),
      guards,
    }),
  );
  // Sync (issue 5): push, pull, conflicts, repeat groups, attachments.
  const syncRepo = createSyncRepository(deps.db);
  const repeats = createRepeatsService({ repo: syncRepo, logger: deps.logger });
  const sync = createSyncService({ repo: syncRepo, logger: deps.logger, onRepeatsDirty: repeats.schedule });
  api.use(syncRouter({ sync, repeats, guards }));
  api.use(attachmentsRouter({ attachments: createAttachmentsService({ repo: createAttachmentsRepository(deps.db), storage }), guards }));
  // Survey maps (issue 7 §1–2, §6): maps, comparison, GeoJSON export; computed here, stored per data version.
  api.use(surveyMapRouter({ surveyMap: createSurveyMapService({ repo: createSurveyMapRepository(deps.db), logger: deps.logger }), guards }));
  // Review (issue 7 §3–7): review table, decisions, submit / sign-off / reopen, report, readings CSV.
  {
    const reviewRepo = createReviewRepository(deps.db);
    const review = createReviewService({ repo: reviewRepo, mailer: deps.mailer, publicUrl: deps.publicUrl, logger: deps.logger });
    api.use(reviewRouter({ review, csv: createReadingsCsv({ repo: reviewRepo, review }), guards }));
  }
  // EMC (issue 8 §4): sweeps explained — peaks matched to predicted lines.
  api.use(emcSweepsRouter({ emcSweeps: createEmcSweepsService({ repo: createEmcSweepsRepository(deps.db), storage, logger: deps.logger }), guards }));
  api.use(auditRouter({ audit: createAuditService(createAuditRepository(deps.db)), guards }));
  api.use(devMailRouter({ capture: deps.mailCapture ?? null, auth: authService, guards }));
  api.use(apiNotFound);
  app.use('/api', api);

  if (deps.client && 'dir' in deps.client) app.use(serveClient(deps.client.dir));
  if (deps.client && 'middleware' in deps.client) app.use(deps.client.middleware);

  app.use(apiNotFound);
  app.use(errorHandler(deps.logger));

  return {
    app,
    async close() {
      session.store.close();
      await repeats.close();
    },
  };
}
