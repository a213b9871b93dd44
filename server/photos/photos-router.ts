import { pipeline } from 'node:stream/promises';
import { type Request, type Response, Router } from 'express';
import multer, { MulterError } from 'multer';
import {
  listPhotosQuery,
  photoParams,
  photoVariantParams,
  updatePhotoBody,
  uploadPhotoFields,
} from '../../common/contracts/photos';
import { trialSlugParams } from '../../common/contracts/trials';
import type { AppDeps } from '../app-deps';
import { actorOf, requireActor } from '../auth/actor';
import { AppError } from '../lib/app-error';
import { endpoint, parseOr400 } from '../lib/endpoint';
import { trialForAction } from '../trials/trials-service';
import { defaultPhotoLimits } from './photo-processing';
import * as service from './photos-service';

const megabytes = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

/** Mounted at /api/trials/:slug/photos. */
export function photosRouter(deps: Pick<AppDeps, 'db' | 'env' | 'storage'>) {
  const photoDeps: service.PhotoDeps = {
    db: deps.db,
    storage: deps.storage,
    limits: defaultPhotoLimits,
  };
  const limits = photoDeps.limits!;
  const upload = multer({
    storage: multer.memoryStorage(),
    limits: {
      fileSize: limits.maxBytes,
      files: limits.maxFiles,
      fields: 20,
      fieldSize: 4096,
      parts: limits.maxFiles + 20,
    },
  }).array('photo', limits.maxFiles);

  const receive = (req: Request, res: Response) =>
    new Promise<void>((resolve, reject) =>
      upload(req, res, (err: unknown) => (err ? reject(translateMulterError(err)) : resolve())),
    );

  function translateMulterError(err: unknown) {
    if (err instanceof AppError) return err;
    // Anything else the form parser stops on is the form itself: no boundary, a truncated
    // body, a malformed part header.
    if (!(err instanceof MulterError))
      return new AppError(
        'validation_failed',
        `The upload is not a well-formed multipart form: ${(err as Error)?.message ?? 'unreadable'}.`,
        { fields: [{ path: 'body', message: 'Not a well-formed multipart form.' }] },
      );
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return new AppError(
          'payload_too_large',
          `Each photo can be at most ${megabytes(limits.maxBytes)}; this one is larger.`,
          { limit: limits.maxBytes, field: 'photo' },
        );
      case 'LIMIT_FILE_COUNT':
      case 'LIMIT_UNEXPECTED_FILE':
        if (err.field && err.field !== 'photo') {
          return new AppError('validation_failed', 'Send photos in the "photo" field.', {
            fields: [{ path: `body.${err.field}`, message: 'Unexpected file field.' }],
          });
        }
        return new AppError(
          'payload_too_large',
          `At most ${limits.maxFiles} photos can be sent in one upload.`,
          { limit: limits.maxFiles, field: 'photo' },
        );
      default:
        return new AppError('payload_too_large', `The upload is too large: ${err.message}.`, {
          field: err.field,
        });
    }
  }

  const router = Router({ mergeParams: true });

  router.get(
    '/',
    endpoint(
      { params: trialSlugParams, query: listPhotosQuery },
      async ({ params, query }, _req, res) => {
        res.json({ photos: await service.listPhotos(photoDeps, params.slug, actorOf(res), query) });
      },
    ),
  );

  router.get(
    '/tagging',
    endpoint({ params: trialSlugParams }, async ({ params }, _req, res) => {
      res.json(await service.tagging(photoDeps, params.slug, actorOf(res)));
    }),
  );

  router.post(
    '/',
    endpoint({ params: trialSlugParams }, async ({ params }, req, res) => {
      // Permission first: a stranger's upload is refused before its bytes are kept.
      const actor = actorOf(res);
      const loaded = await trialForAction(deps.db, params.slug, actor, 'photos.upload');
      await receive(req, res);
      const files = (req.files as Express.Multer.File[] | undefined) ?? [];
      const fields = parseOr400(uploadPhotoFields, req.body ?? {}, 'body');
      const { photos, created } = await service.uploadPhotos(
        photoDeps,
        loaded,
        requireActor(res),
        params.slug,
        files,
        fields,
      );
      // A retry of an upload already stored answers 200 with the photos it made.
      res.status(created ? 201 : 200).json({ photos });
    }),
  );

  router.patch(
    '/:photoId',
    endpoint(
      { params: photoParams, body: updatePhotoBody },
      async ({ params, body }, _req, res) => {
        const photo = await service.updatePhoto(
          photoDeps,
          params.slug,
          actorOf(res),
          params.photoId,
          body,
        );
        res.json({ photo });
      },
    ),
  );

  router.delete(
    '/:photoId',
    endpoint({ params: photoParams }, async ({ params }, _req, res) => {
      res.json(await service.deletePhoto(photoDeps, params.slug, actorOf(res), params.photoId));
    }),
  );

  router.post(
    '/:photoId/restore',
    endpoint({ params: photoParams }, async ({ params }, _req, res) => {
      const photo = await service.restorePhoto(
        photoDeps,
        params.slug,
        actorOf(res),
        params.photoId,
      );
      res.json({ photo });
    }),
  );

  router.put(
    '/:photoId/cover',
    endpoint({ params: photoParams }, async ({ params }, _req, res) => {
      res.json({
        photo: await service.setCover(photoDeps, params.slug, actorOf(res), params.photoId, true),
      });
    }),
  );

  router.delete(
    '/:photoId/cover',
    endpoint({ params: photoParams }, async ({ params }, _req, res) => {
      res.json({
        photo: await service.setCover(photoDeps, params.slug, actorOf(res), params.photoId, false),
      });
    }),
  );

  router.get(
    '/:photoId/:variant',
    endpoint({ params: photoVariantParams }, async ({ params }, req, res) => {
      const served = await service.photoFile(
        photoDeps,
        params.slug,
        actorOf(res),
        params.photoId,
        params.variant,
      );
      res.setHeader('Cache-Control', served.cacheControl);
      res.setHeader('ETag', served.etag);
      res.setHeader('Vary', 'Cookie');
      if (req.headers['if-none-match'] === served.etag) {
        served.file.body.destroy();
        res.status(304).end();
        return;
      }
      res.setHeader('Content-Type', served.file.contentType);
      res.setHeader('Content-Length', String(served.file.size));
      res.setHeader('Content-Disposition', `inline; filename="${served.filename}"`);
      await pipeline(served.file.body, res);
    }),
  );

  return router;
}
