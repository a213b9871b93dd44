import fs from 'node:fs';
import path from 'node:path';
import express, { type Router } from 'express';
import helmet from 'helmet';
import compression from 'compression';
import { entryLotsRouter, seedRouter, varietySeedRouter } from './seed/seed-router';
import { pinoHttp } from 'pino-http';
import { toNodeHandler } from 'better-auth/node';
import { projectRoot } from './env';
import { resolveActor } from './auth/actor';
import { sameOriginOnly } from './auth/origin-check';
import type { AppDeps } from './app-deps';
import { CLIENT_IP_HEADER } from './auth/auth';
import { healthRouter, readyRouter } from './health/health-router';
import { mailboxInUse, mailboxRouter, thisMachineOnly } from './mail/mailbox-router';
import { trialMailRouter } from './mail/trial-mail-router';
import { invitationLinksRouter, trialInvitationsRouter } from './invitations/invitations-router';
import { membersRouter } from './members/members-router';
import { meRouter, sessionRouter } from './me/me-router';
import { photosRouter } from './photos/photos-router';
import { groupsRouter, varietiesRouter } from './varieties/varieties-router';
import { apiNotFound, errorHandler } from './lib/error-handler';
import { refuseNul } from './lib/refuse-nul';
import { trialsRouter } from './trials/trials-router';
import { publicResultsRouter, resultsSheetRouter } from './results/results-router';
import { sheetPage } from './results/sheet-page';
import { comparisonRouter } from './results/comparison-router';
import { designRouter } from './design/design-router';
import { analyzeRouter, trialAnalysisRouter } from './analysis/analysis-router';
import { weatherRouter } from './weather/weather-router';
import { auditRouter } from './audit/audit-router';
import {
  fieldEventsRouter,
  harvestsRouter,
  observationsRouter,
  recordsRouter,
} from './records/records-router';

/**
 * Every API router behind sign-in resolution, with its mount path. Routers mounted under a
 * trial (`/api/trials/:slug/...`) use `Router({ mergeParams: true })`. The authorization
 * matrix test lists the routes from here, so a new route cannot skip it.
 */
export function apiMounts(deps: AppDeps): [string, Router][] {
  return [
    ['/api/me', meRouter(deps)],
    ['/api/session', sessionRouter(deps)],
    ['/api/trials', trialsRouter(deps)],
    ['/api/trials/:slug/photos', photosRouter(deps)],
    ['/api/trials/:slug/members', membersRouter(deps)],
    ['/api/trials/:slug/invitations', trialInvitationsRouter(deps)],
    ['/api/trials/:slug/mail', trialMailRouter(deps)],
    ['/api/invitations', invitationLinksRouter(deps)],
    ['/api/trials', designRouter(deps)],
    ['/api/trials/:slug', trialAnalysisRouter(deps)],
    ['/api/trials/:slug', weatherRouter(deps)],
    ['/api/analyze', analyzeRouter(deps)],
    ['/api/trials/:slug/harvests', harvestsRouter(deps)],
    ['/api/trials/:slug/observations', observationsRouter(deps)],
    ['/api/trials/:slug/field-events', fieldEventsRouter(deps)],
    ['/api/trials/:slug/records', recordsRouter(deps)],
    ['/api/trials/:slug/audit', auditRouter(deps)],
    ['/api/trials/:slug/results-sheet', resultsSheetRouter(deps)],
    ['/api/results', publicResultsRouter(deps)],
    ['/api/trials/:slug/comparison', comparisonRouter(deps)],
    ['/api/groups', groupsRouter(deps)],
    ['/api/varieties', varietiesRouter(deps)],
    ['/api/varieties/:slug/seed', varietySeedRouter(deps)],
    ['/api/seed', seedRouter(deps)],
    ['/api/trials/:slug/entry-lots', entryLotsRouter(deps)],
  ];
}

export function createApp(deps: AppDeps) {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: { 'img-src': ["'self'", 'data:', 'blob:'], 'upgrade-insecure-requests': null },
      },
    }),
  );
  app.use(
    pinoHttp({
      logger: deps.logger,
      autoLogging: { ignore: (req) => req.url === '/api/health' || req.url === '/api/ready' },
      // A line per request only at debug level; a failure (5xx) is always logged.
      customLogLevel: (_req, res, err) => (err || res.statusCode >= 500 ? 'error' : 'debug'),
      serializers: {
        req: (req: { method: string; url: string }) => ({ method: req.method, url: req.url }),
        res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
      },
    }),
  );
  // Text answers (the app's JS and CSS, JSON, CSV) go out compressed; a phone in a field pays
  // for every byte. Images and PDFs are already compressed and are left as they are.
  app.use(compression());
  // While shutting down, each answer (also one to a request that came before) closes its
  // connection, so the client opens its next one elsewhere.
  app.use((_req, res, next) => {
    const writeHead = res.writeHead;
    res.writeHead = function (this: typeof res, ...args: Parameters<typeof writeHead>) {
      if (deps.lifecycle.draining) this.shouldKeepAlive = false;
      return writeHead.apply(this, args);
    } as typeof writeHead;
    next();
  });
  // Rate limits key on the caller's address: the socket's, or the one a loopback proxy forwards.
  app.use((req, _res, next) => {
    req.headers[CLIENT_IP_HEADER] = req.ip ?? req.socket.remoteAddress ?? 'unknown';
    next();
  });

  // The sign-in library reads a body we have parsed as the same JSON again, so it gets its
  // JSON checked for NUL characters first like every other route.
  const json = express.json({ limit: '1mb' });
  app.all('/api/auth/*splat', json, refuseNul, toNodeHandler(deps.auth));
  app.use(json);
  app.use('/api', refuseNul);
  app.use('/api/health', healthRouter(deps));
  app.use('/api/ready', readyRouter(deps));
  app.use('/api', sameOriginOnly([deps.baseUrl]));
  // Published sheets and their downloads are the same for everyone: no session lookup.
  app.use(
    '/api',
    resolveActor(deps.auth, (path) => path === '/results' || path.startsWith('/results/')),
  );
  const mailbox = mailboxInUse(deps.env, deps.mailbox) ? deps.mailbox : undefined;
  if (mailbox) app.use('/api/dev/mailbox', mailboxRouter(mailbox));
  for (const [mountPath, router] of apiMounts(deps)) app.use(mountPath, router);
  app.use('/api', apiNotFound);

  if (deps.clientDir && fs.existsSync(path.join(deps.clientDir, 'index.html'))) {
    const clientDir = deps.clientDir;
    app.use(
      express.static(clientDir, {
        index: false,
        maxAge: '1h',
        setHeaders: (res, file) => {
          // Built assets carry a hash of their content in the name: a new release has new names,
          // so a copy can be kept for a year without asking again.
          if (file.includes(`${path.sep}assets${path.sep}`))
            res.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
          // The service worker and manifest must be re-checked on every visit to pick up a release.
          else if (/(?:sw\.js|workbox-[\w-]+\.js|manifest\.webmanifest)$/.test(file))
            res.setHeader('Cache-Control', 'no-cache');
        },
      }),
    );
    // The mailbox page, like its API, is for this computer only (and only while in use).
    app.get('/dev/mailbox', mailbox ? thisMachineOnly : (_req, res) => res.status(404).end());
    // Client routes are the browser router's; every other GET gets the app shell.
    const shell = fs.readFileSync(path.join(clientDir, 'index.html'), 'utf8');
    app.get('/{*splat}', async (req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      const sheet = await sheetPage(deps.db, req.path, deps.baseUrl, clientDir);
      // Replacer functions: a string would expand `$&`, `$'` and the like from a trial's title.
      let page = sheet ? shell.replace(/<title>[^<]*<\/title>/, () => sheet.meta) : shell;
      const markup = sheet?.markup;
      if (markup) page = page.replace('<div id="root"></div>', (root) => root + markup);
      res.type('html').send(page);
    });
  }
  app.use(errorHandler);
  return app;
}

export const defaultClientDir = path.join(projectRoot, 'dist', 'client');
