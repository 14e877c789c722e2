import type { Readable } from 'node:stream';
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import type { Env } from '../config/env.js';
import { logger } from './logger.js';

/** Thrown when the object store cannot be reached or refuses a request; answered as 503. */
export class StorageUnavailableError extends Error {
  constructor(operation: string, cause: unknown) {
    super(`Object storage ${operation} failed: ${cause instanceof Error ? cause.message : String(cause)}`, { cause });
    this.name = 'StorageUnavailableError';
  }
}

export interface StoredObject {
  body: Readable;
  contentType: string | undefined;
  contentLength: number | undefined;
}

/** The few object-store operations the app needs: private objects, read back only through the API. */
export interface ObjectStorage {
  /** Creates the bucket when it is missing (HeadBucket, then CreateBucket). */
  ensureBucket(): Promise<void>;
  put(key: string, body: Buffer, contentType: string): Promise<void>;
  /** The object as a stream, or null when there is no such key. */
  get(key: string): Promise<StoredObject | null>;
  delete(key: string): Promise<void>;
}

export type StorageConfig = Pick<Env, 'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY'>;

function newClient(config: StorageConfig) {
  return new S3Client({
    endpoint: config.S3_ENDPOINT,
    region: config.S3_REGION,
    forcePathStyle: true,
    credentials: { accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY },
    // Checksums only where an operation requires them: the default (CRC32 trailers in an
    // aws-chunked body) is not understood by every S3-compatible store, the local fake included.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
    maxAttempts: 2,
  });
}

const statusOf = (err: unknown) => (err instanceof S3ServiceException ? err.$metadata.httpStatusCode : undefined);

/** An S3 client for the configured endpoint (path-style, so any S3-compatible store or the local fake works). */
export function createObjectStorage(config: StorageConfig): ObjectStorage {
  // Made on first use: an app that never touches a file (most tests) needs no S3 client.
  let s3: S3Client | undefined;
  const client = () => (s3 ??= newClient(config));
  const Bucket = config.S3_BUCKET;

  return {
    async ensureBucket() {
      try {
        await client().send(new HeadBucketCommand({ Bucket }));
        return;
      } catch (err) {
        if (statusOf(err) !== 404) throw new StorageUnavailableError('HeadBucket', err);
      }
      try {
        await client().send(new CreateBucketCommand({ Bucket }));
        logger.info('created the object storage bucket', { bucket: Bucket });
      } catch (err) {
        // Another process may have created it in the meantime.
        if (err instanceof S3ServiceException && (err.name === 'BucketAlreadyOwnedByYou' || err.name === 'BucketAlreadyExists')) return;
        throw new StorageUnavailableError('CreateBucket', err);
      }
    },

    async put(key, body, contentType) {
      try {
        await client().send(new PutObjectCommand({ Bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.length }));
      } catch (err) {
        throw new StorageUnavailableError('PutObject', err);
      }
    },

    async get(key) {
      try {
        const out = await client().send(new GetObjectCommand({ Bucket, Key: key }));
        return { body: out.Body as Readable, contentType: out.ContentType, contentLength: out.ContentLength };
      } catch (err) {
        if (statusOf(err) === 404) return null;
        throw new StorageUnavailableError('GetObject', err);
      }
    },

    async delete(key) {
      try {
        await client().send(new DeleteObjectCommand({ Bucket, Key: key }));
      } catch (err) {
        throw new StorageUnavailableError('DeleteObject', err);
      }
    },
  };
}

/**
 * Creates the bucket at start-up, retrying for a while because the store (or the local fake started
 * beside the server) may still be starting. Gives up with a logged error rather than refusing to
 * serve: everything but uploads and file downloads works without the store.
 */
export async function ensureBucketAtStart(storage: ObjectStorage, { attempts = 20, delayMs = 500 } = {}): Promise<boolean> {
  for (let i = 1; i <= attempts; i++) {
    try {
      await storage.ensureBucket();
      return true;
    } catch (err) {
      if (i === attempts) {
        logger.error('object storage unreachable: uploads and file downloads will fail until it is', { err: String(err) });
        return false;
      }
      await new Promise((r) => setTimeout(r, delayMs));
    }
  }
  return false;
}
