import express, { Router, type RequestHandler } from 'express';
import { pipeline } from 'node:stream/promises';
import type { Db } from '../../db/client.js';
import { IdParams } from '../../../shared/schemas/common.js';
import { FIELD_ROLES } from '../../../shared/schemas/enums.js';
import { AttachmentUploadParams, AttachmentUploadQuery, MAX_ATTACHMENT_BYTES } from '../../../shared/schemas/visits.js';
import { AppError } from '../../lib/errors.js';
import { logger } from '../../lib/logger.js';
import type { ObjectStorage } from '../../lib/object-storage.js';
import { currentUser, requireAuth, requireRole } from '../../middleware/auth.js';
import { validate } from '../../middleware/validate.js';
import { mediaTypeOf } from './file-type.js';
import * as service from './attachments.service.js';

const rawFile = express.raw({ type: () => true, limit: MAX_ATTACHMENT_BYTES });

/** Reads the request body as the file, answering 413 naming the file when it is over the limit. */
const readFile: RequestHandler = (req, res, next) => {
  rawFile(req, res, (err?: unknown) => {
    if ((err as { type?: string } | undefined)?.type === 'entity.too.large') {
      const mb = MAX_ATTACHMENT_BYTES / 1024 / 1024;
      next(new AppError('PAYLOAD_TOO_LARGE', 413, `The file is larger than ${mb} MB`, [{ field: 'file', message: `must be at most ${mb} MB` }]));
      return;
    }
    next(err);
  });
};

/**
 * PUT /api/homes/:homeId/attachments/:attachmentId?kind=…: the request body is the file itself.
 * Authorisation and the query are checked before the body is read.
 */
export function homeAttachmentsRouter(db: Db, storage: ObjectStorage): Router {
  const router = Router();
  router.put(
    '/:homeId/attachments/:attachmentId',
    requireRole(...FIELD_ROLES),
    validate({ params: AttachmentUploadParams, query: AttachmentUploadQuery }),
    readFile,
    async (req, res) => {
      const { created, attachment } = await service.uploadAttachment({ db, storage }, currentUser(req), {
        homeId: req.params.homeId as string,
        attachmentId: req.params.attachmentId as string,
        query: req.query as unknown as AttachmentUploadQuery,
        contentType: mediaTypeOf(req.get('content-type')),
        bytes: Buffer.isBuffer(req.body) ? req.body : Buffer.alloc(0),
      });
      res.status(created ? 201 : 200).json({ attachment });
    },
  );
  return router;
}

/** GET /api/attachments/:id and /:id/thumbnail: the bytes, streamed from storage after a company check. */
export function attachmentsRouter(db: Db, storage: ObjectStorage): Router {
  const router = Router();
  const send = (variant: 'original' | 'thumbnail'): RequestHandler => async (req, res) => {
    const file = await service.openAttachment({ db, storage }, currentUser(req), req.params.id as string, variant);
    // Inline (a PDF opens in the browser), under the name it was uploaded with.
    if (file.fileName) res.set('Content-Disposition', res.attachment(file.fileName).get('Content-Disposition')!.replace(/^attachment/, 'inline'));
    res.set({
      'Content-Type': file.contentType,
      // Private: a customer's home; the bytes under an id never change, so the browser may keep them.
      'Cache-Control': 'private, max-age=86400',
      'X-Content-Type-Options': 'nosniff',
    });
    if (file.contentLength !== undefined) res.set('Content-Length', String(file.contentLength));
    try {
      await pipeline(file.body, res);
    } catch (err) {
      // Once bytes have gone out there is no error response to give: cut the connection instead.
      if (!res.headersSent) throw err;
      logger.warn('attachment stream ended early', { id: req.params.id, err: String(err) });
      res.destroy();
    }
  };
  router.get('/:id', requireAuth, validate({ params: IdParams }), send('original'));
  router.get('/:id/thumbnail', requireAuth, validate({ params: IdParams }), send('thumbnail'));
  return router;
}
