import { type Request, type Response, Router } from 'express';
import {
  followBody,
  followerTokenQuery,
  publishBody,
  publishedSheetsQuery,
  resultSlugParams,
  resultVersionParams,
  saveSheetBody,
} from '../../common/contracts/results';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf } from '../auth/actor';
import { endpoint } from '../lib/endpoint';
import { meansCsv, plotsCsv } from './results-csv';
import { renderSheetPdf } from './results-pdf';
import * as service from './results-service';
import { sheetPage } from './sheet-page';
import { z } from 'zod';

type Deps = Pick<AppDeps, 'db' | 'logger' | 'env' | 'storage' | 'clientDir'> & {
  mail: service.ResultsDeps['mail'];
  baseUrl: string;
};

const resultsDeps = (deps: Deps): service.ResultsDeps => ({
  db: deps.db,
  mail: deps.mail,
  baseUrl: deps.baseUrl,
});

/** The lead's side, under /api/trials/:slug/results-sheet. */
export function resultsSheetRouter(deps: Deps) {
  const r = resultsDeps(deps);
  const router = Router({ mergeParams: true });
  router.get(
    '/',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.getDraft(r, params.slug, actorOf(res)));
    }),
  );
  router.put(
    '/',
    endpoint(
      { params: trialSlugParams, body: saveSheetBody },
      async ({ params, body }, _req, res) => {
        res.json(await service.saveDraft(r, params.slug, actorOf(res), body));
      },
    ),
  );
  router.get(
    '/preview',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.preview(r, params.slug, actorOf(res)));
    }),
  );
  router.post(
    '/publish',
    endpoint(
      { params: trialSlugParams, body: publishBody },
      async ({ params, body }, _req, res) => {
        res.status(201).json(await service.publish(r, params.slug, actorOf(res), body.changeNote));
        // Draw the new version's page now, so its first reader does not wait for it.
        if (deps.clientDir)
          sheetPage(deps.db, `/r/${params.slug}`, deps.baseUrl, deps.clientDir).catch(
            (err: unknown) =>
              deps.logger.warn({ err }, 'The published sheet could not be drawn ahead'),
          );
      },
    ),
  );
  router.post(
    '/unpublish',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      await service.unpublish(r, params.slug, actorOf(res));
      res.status(204).end();
    }),
  );
  return router;
}

const publishedPhotoParams = resultVersionParams.extend({
  photoId: z.uuid('Not a photo id.'),
  variant: z.enum(['thumb', 'display']),
});

const downloadQuery = z.object({
  size: z.enum(['a4', 'letter']).default('a4'),
  trait: z.string().optional(),
});

/**
 * Any cache may keep a published answer but must ask again before each use (RFC 9111 §5.2.2.4,
 * no-cache): the latest version's address and the version list change when the lead publishes,
 * all of them when the sheet is withdrawn or an entry relinked, and a reader must not be shown the
 * old numbers meanwhile. Asking again is cheap: the strong ETag answers 304 with no body.
 */
const cachePublished = (res: Response) => res.setHeader('Cache-Control', 'public, no-cache');

/**
 * A frozen version as stored bytes: gzip-compressed once at freezing for a reader who accepts
 * it (the compression middleware leaves an answer that already has an encoding alone), each
 * encoding with its own strong ETag (RFC 9110 §8.8.3), and 304 when the reader has it.
 */
function sendFrozen(req: Request, res: Response, frozen: service.FrozenVersion) {
  cachePublished(res);
  res.setHeader('Vary', 'Accept-Encoding');
  // Express's negotiation, as the compression middleware's: honours q=0 and `*`.
  const gzip = req.acceptsEncodings('gzip', 'identity') === 'gzip';
  const etag = gzip ? frozen.gzipEtag : frozen.etag;
  res.setHeader('ETag', etag);
  const asked = req.headers['if-none-match'];
  if (asked && asked.split(',').some((t) => t.trim() === etag)) {
    res.status(304).end();
    return;
  }
  res.type('application/json');
  if (gzip) res.setHeader('Content-Encoding', 'gzip');
  res.send(gzip ? frozen.gzip : frozen.body);
}

/** Public reading, downloads and following, under /api/results. Anyone may call these. */
export function publicResultsRouter(deps: Deps) {
  const r = resultsDeps(deps);
  const { storage } = deps;
  const router = Router();

  router.get(
    '/',
    // Not cached: a sheet published a minute ago belongs in the list now.
    endpoint({ query: publishedSheetsQuery }, async ({ query }, _req, res) => {
      res.json(await service.publishedSheets(deps.db, query));
    }),
  );
  router.post(
    '/unsubscribe',
    endpoint({ query: followerTokenQuery }, async ({ query }, _req, res) => {
      res.json(await service.unsubscribe(deps.db, query.token));
    }),
  );
  router.post(
    '/followers/confirm',
    endpoint({ body: followerTokenQuery }, async ({ body }, _req, res) => {
      res.json(await service.confirmFollow(deps.db, body.token));
    }),
  );
  router.get(
    '/:slug',
    endpoint({ params: resultSlugParams }, async ({ params }, req, res) => {
      sendFrozen(req, res, await service.frozenVersion(deps.db, params.slug));
    }),
  );
  router.get(
    '/:slug/versions',
    endpoint({ params: resultSlugParams }, async ({ params }, _req, res) => {
      cachePublished(res);
      res.json(await service.publicVersions(deps.db, params.slug));
    }),
  );
  router.post(
    '/:slug/followers',
    endpoint({ params: resultSlugParams, body: followBody }, async ({ params, body }, req, res) => {
      await service.follow(r, params.slug, body.email, req.ip ?? req.socket.remoteAddress ?? '');
      res
        .status(202)
        .json({ message: 'If the address can receive mail, a confirmation link is on its way.' });
    }),
  );
  router.get(
    '/:slug/v/:version',
    endpoint({ params: resultVersionParams }, async ({ params }, req, res) => {
      sendFrozen(req, res, await service.frozenVersion(deps.db, params.slug, params.version));
    }),
  );
  router.get(
    '/:slug/v/:version/results.json',
    endpoint({ params: resultVersionParams }, async ({ params }, _req, res) => {
      const s = await service.publicVersion(deps.db, params.slug, params.version);
      res
        .attachment(`${s.trial.slug}-v${s.version}.json`)
        .type('application/json')
        .send(JSON.stringify(s, null, 2));
    }),
  );
  router.get(
    '/:slug/v/:version/means.csv',
    endpoint({ params: resultVersionParams }, async ({ params }, _req, res) => {
      const s = await service.publicVersion(deps.db, params.slug, params.version);
      res.attachment(`${s.trial.slug}-v${s.version}-means.csv`).type('text/csv').send(meansCsv(s));
    }),
  );
  router.get(
    '/:slug/v/:version/plots.csv',
    endpoint(
      { params: resultVersionParams, query: downloadQuery },
      async ({ params, query }, _req, res) => {
        const s = await service.publicVersion(deps.db, params.slug, params.version);
        res
          .attachment(
            `${s.trial.slug}-v${s.version}-plots${query.trait ? `-${query.trait}` : ''}.csv`,
          )
          .type('text/csv')
          .send(plotsCsv(s, query.trait));
      },
    ),
  );
  router.get(
    '/:slug/v/:version/sheet.pdf',
    endpoint(
      { params: resultVersionParams, query: downloadQuery },
      async ({ params, query }, _req, res) => {
        const s = await service.publicVersion(deps.db, params.slug, params.version);
        const photos = await service.sheetPhotosForPdf(deps.db, storage, s);
        const pdf = await renderSheetPdf(s, query.size === 'letter' ? 'LETTER' : 'A4', photos);
        res.attachment(`${s.trial.slug}-v${s.version}.pdf`).type('application/pdf').send(pdf);
      },
    ),
  );
  router.get(
    '/:slug/v/:version/photos/:photoId/:variant',
    endpoint({ params: publishedPhotoParams }, async ({ params }, req, res) => {
      const photo = await service.publishedPhoto(deps.db, storage, params);
      const etag = `"${photo.etag}"`;
      res.setHeader('ETag', etag);
      // A version's photos never change: cache for a day anywhere.
      res.setHeader('Cache-Control', 'public, max-age=86400');
      if (req.headers['if-none-match'] === etag) {
        photo.file.body.destroy();
        res.status(304).end();
        return;
      }
      res.type(photo.file.contentType).setHeader('Content-Length', String(photo.file.size));
      photo.file.body.pipe(res);
    }),
  );
  return router;
}
