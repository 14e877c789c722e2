import type { Db } from '../../db/client.js';
import type { SessionUser } from '../../../shared/schemas/auth.js';
import {
  LAB_REPORT_CONTENT_TYPES,
  MAX_ATTACHMENT_BYTES,
  PHOTO_CONTENT_TYPES,
  type AttachmentDto,
  type AttachmentUploadQuery,
} from '../../../shared/schemas/visits.js';
import { AppError, type FieldError } from '../../lib/errors.js';
import { logger } from '../../lib/logger.js';
import type { ObjectStorage } from '../../lib/object-storage.js';
import { sniffFileType } from './file-type.js';
import { makeThumbnail } from './thumbnail.js';
import * as repo from './attachments.repository.js';

type Viewer = Pick<SessionUser, 'companyId'>;

export interface AttachmentDeps {
  db: Db;
  storage: ObjectStorage;
}

export interface Upload {
  homeId: string;
  attachmentId: string;
  query: AttachmentUploadQuery;
  /** The media type the client declared (Content-Type without parameters). */
  contentType: string;
  bytes: Buffer;
}

const TYPE_LABELS: Record<string, string> = {
  'image/jpeg': 'a JPEG image',
  'image/png': 'a PNG image',
  'image/webp': 'a WebP image',
  'application/pdf': 'a PDF',
};

const toDto = (row: Pick<repo.AttachmentRow, 'id' | 'kind' | 'subject' | 'contentType' | 'byteSize'>): AttachmentDto => ({
  id: row.id,
  kind: row.kind as AttachmentDto['kind'],
  subject: row.subject as AttachmentDto['subject'],
  contentType: row.contentType,
  byteSize: row.byteSize,
});

const fileError = (status: number, message: string) => new AppError('VALIDATION_FAILED', status, `Invalid file: ${message}`, [{ field: 'file', message }]);

/** Where a home's file lives in the bucket: tenant first, so a company's objects can be listed, moved or purged together. */
export const storageKeyOf = (companyId: string, homeId: string, attachmentId: string) => `${companyId}/${homeId}/${attachmentId}`;
export const thumbnailKeyOf = (key: string) => `${key}-thumb.jpg`;

/** A file name as given, without any folder part or control characters, for Content-Disposition later. */
function cleanName(name: string) {
  return (name.split(/[\\/]/).pop() ?? '').replace(/[\u0000-\u001f\u007f]/g, '').trim().slice(0, 255);
}

/** Refuses a file whose declared type is not one the kind accepts, or whose bytes are not of that type. */
function checkFile(kind: AttachmentUploadQuery['kind'], contentType: string, bytes: Buffer) {
  const accepted: readonly string[] = kind === 'photo' ? PHOTO_CONTENT_TYPES : LAB_REPORT_CONTENT_TYPES;
  const expected = kind === 'photo' ? 'a JPEG, PNG or WebP image' : 'a PDF';
  if (contentType === '') throw fileError(400, `send the file's type as the Content-Type header (${expected})`);
  if (!accepted.includes(contentType)) throw fileError(415, `must be ${expected} (got ${contentType})`);
  if (bytes.length === 0) throw fileError(400, 'is empty');
  if (bytes.length > MAX_ATTACHMENT_BYTES) throw fileError(413, `must be at most ${MAX_ATTACHMENT_BYTES / 1024 / 1024} MB`);
  const actual = sniffFileType(bytes);
  if (actual !== contentType) {
    throw fileError(400, `is not ${TYPE_LABELS[contentType]}: its contents ${actual ? `are ${TYPE_LABELS[actual]}` : 'match no accepted format'}`);
  }
}

/**
 * Stores an uploaded photo or lab report: checks it, writes the bytes (and a photo's thumbnail) to
 * object storage, then the row. The row is written only once the objects are stored, and the
 * objects are removed again when the row cannot be written, so no row ever points at nothing.
 * The id comes from the device: a retry of a stored upload answers `created: false`.
 */
export async function uploadAttachment({ db, storage }: AttachmentDeps, viewer: Viewer, upload: Upload): Promise<{ created: boolean; attachment: AttachmentDto }> {
  const { companyId } = viewer;
  const { homeId, attachmentId, query, contentType, bytes } = upload;
  if (!(await repo.homeExists(db, companyId, homeId))) throw AppError.notFound('Home');

  const replay = async () => {
    const existing = await repo.findAttachmentAnyCompany(db, attachmentId);
    if (existing && existing.companyId === companyId && existing.homeId === homeId) return { created: false, attachment: toDto(existing) };
    if (existing) throw AppError.conflict('This attachment id is already used by another record', [{ field: 'attachmentId', message: 'is already used; generate a new id' }]);
    return null;
  };
  const earlier = await replay();
  if (earlier) return earlier;

  checkFile(query.kind, contentType, bytes);
  const fields: FieldError[] = [];
  if (query.visitId && !(await repo.visitOfHome(db, companyId, homeId, query.visitId))) fields.push({ field: 'visitId', message: 'no such visit at this home' });
  if (query.radonTestId && !(await repo.testOfHome(db, companyId, homeId, query.radonTestId))) {
    fields.push({ field: 'radonTestId', message: 'no such radon test at this home' });
  }
  if (fields.length) throw new AppError('VALIDATION_FAILED', 400, `Invalid query: ${fields.map((f) => f.field).join(', ')}`, fields);

  let thumbnail: Buffer | null = null;
  if (query.kind === 'photo') {
    try {
      thumbnail = await makeThumbnail(bytes);
    } catch {
      throw fileError(400, `could not be read as ${TYPE_LABELS[contentType]} (damaged or incomplete)`);
    }
  }

  const storageKey = storageKeyOf(companyId, homeId, attachmentId);
  const thumbnailKey = thumbnail ? thumbnailKeyOf(storageKey) : null;
  const removeObjects = async () => {
    for (const key of [storageKey, thumbnailKey]) {
      if (key) await storage.delete(key).catch((err) => logger.error('could not remove an orphaned object', { key, err: String(err) }));
    }
  };
  await storage.put(storageKey, bytes, contentType);
  if (thumbnail && thumbnailKey) {
    try {
      await storage.put(thumbnailKey, thumbnail, 'image/jpeg');
    } catch (err) {
      await removeObjects();
      throw err;
    }
  }

  let inserted: boolean;
  try {
    inserted = await repo.insertAttachment(db, {
      id: attachmentId,
      companyId,
      homeId,
      visitId: query.visitId ?? null,
      radonTestId: query.radonTestId ?? null,
      kind: query.kind,
      subject: query.kind === 'photo' ? (query.subject ?? null) : null,
      contentType,
      byteSize: bytes.length,
      storageKey,
      thumbnailKey,
      originalName: cleanName(query.name),
    });
  } catch (err) {
    await removeObjects();
    throw err;
  }
  if (!inserted) {
    // The same upload arrived twice at once and the other request wrote the row: the objects
    // under this key are that row's, so they stay. Any other owner of the id has other keys.
    const other = await replay();
    if (other) return other;
    await removeObjects();
    throw AppError.conflict('This attachment id is already used by another record', [{ field: 'attachmentId', message: 'is already used; generate a new id' }]);
  }
  return { created: true, attachment: toDto({ id: attachmentId, kind: query.kind, subject: query.kind === 'photo' ? (query.subject ?? null) : null, contentType, byteSize: bytes.length }) };
}

/** An attachment's bytes (or its thumbnail) for streaming, after checking it belongs to the viewer's company. */
export async function openAttachment({ db, storage }: AttachmentDeps, viewer: Viewer, id: string, variant: 'original' | 'thumbnail') {
  const row = await repo.findAttachment(db, viewer.companyId, id);
  if (!row) throw AppError.notFound('Attachment');
  const key = variant === 'original' ? row.storageKey : row.thumbnailKey;
  if (!key) throw AppError.notFound('Thumbnail');
  const object = await storage.get(key);
  if (!object) {
    logger.error('an attachment row points at a missing object', { id, key });
    throw AppError.notFound('Attachment file');
  }
  return {
    body: object.body,
    contentType: variant === 'original' ? row.contentType : 'image/jpeg',
    contentLength: object.contentLength,
    fileName: variant === 'original' ? row.originalName : '',
  };
}
