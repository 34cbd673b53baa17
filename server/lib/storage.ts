/**
 * The object store, through the AWS SDK: any S3-compatible service in production (S3_ENDPOINT, S3_BUCKET
 * and credentials from the environment), the local fake (server/lib/local-s3.ts) in dev and tests.
 * Path-style addressing, because the local fake and most self-hosted stores do not do virtual hosts.
 */
import { Readable } from 'node:stream';
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  NoSuchKey,
  NotFound,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';

export interface StorageOptions {
  endpoint: string;
  bucket: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
}

export interface StoredObjectInfo {
  contentType: string | undefined;
  contentLength: number | undefined;
  etag: string | undefined;
}

export interface StoredObject extends StoredObjectInfo {
  body: Readable;
}

export interface Storage {
  readonly bucket: string;
  putObject(key: string, body: Buffer | string, contentType: string): Promise<void>;
  /** The object as a stream, or null when there is no such key. */
  getObject(key: string): Promise<StoredObject | null>;
  /** Metadata, or null when there is no such key. */
  headObject(key: string): Promise<StoredObjectInfo | null>;
  /** Idempotent: deleting a missing key is not an error. */
  deleteObject(key: string): Promise<void>;
  /** Every key under a prefix (tests and housekeeping; pages through the listing). */
  listKeys(prefix?: string): Promise<string[]>;
  /** Creates the bucket when it is missing (dev and tests; production buckets are made by their owner). */
  ensureBucket(): Promise<void>;
  close(): void;
}

function isMissing(error: unknown): boolean {
  if (error instanceof NoSuchKey || error instanceof NotFound) return true;
  return error instanceof S3ServiceException && (error.$metadata.httpStatusCode === 404 || error.name === 'NoSuchKey' || error.name === 'NotFound');
}

export function createStorage(options: StorageOptions): Storage {
  const client = new S3Client({
    endpoint: options.endpoint,
    region: options.region,
    forcePathStyle: true,
    credentials: { accessKeyId: options.accessKeyId, secretAccessKey: options.secretAccessKey },
  });
  const Bucket = options.bucket;

  return {
    bucket: Bucket,
    async putObject(key, body, contentType) {
      await client.send(new PutObjectCommand({ Bucket, Key: key, Body: body, ContentType: contentType }));
    },
    async getObject(key) {
      try {
        const out = await client.send(new GetObjectCommand({ Bucket, Key: key }));
        if (!out.Body) return null;
        return { body: out.Body as Readable, contentType: out.ContentType, contentLength: out.ContentLength, etag: out.ETag };
      } catch (error) {
        if (isMissing(error)) return null;
        throw error;
      }
    },
    async headObject(key) {
      try {
        const out = await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return { contentType: out.ContentType, contentLength: out.ContentLength, etag: out.ETag };
      } catch (error) {
        if (isMissing(error)) return null;
        throw error;
      }
    },
    async deleteObject(key) {
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
    async listKeys(prefix) {
      const keys: string[] = [];
      let token: string | undefined;
      do {
        const out = await client.send(new ListObjectsV2Command({ Bucket, Prefix: prefix, ContinuationToken: token }));
        for (const item of out.Contents ?? []) if (item.Key) keys.push(item.Key);
        token = out.IsTruncated ? out.NextContinuationToken : undefined;
      } while (token);
      return keys;
    },
    async ensureBucket() {
      try {
        await client.send(new HeadBucketCommand({ Bucket }));
      } catch (error) {
        if (!isMissing(error)) throw error;
        await client.send(new CreateBucketCommand({ Bucket }));
      }
    },
    close() {
      client.destroy();
    },
  };
}

/** Reads a stored object fully (small files only: antenna-factor tables, seed checks). */
export async function readObjectBuffer(object: StoredObject): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of object.body) chunks.push(Buffer.from(chunk as Uint8Array));
  return Buffer.concat(chunks);
}

/** Stands in when the app is built without an object store (a few foundation tests): file routes answer 503. */
export function unavailableStorage(): Storage {
  const fail = async (): Promise<never> => {
    const { AppError } = await import('./errors');
    throw new AppError('SERVICE_UNAVAILABLE', 'The file store is not configured on this server.');
  };
  return { bucket: '', putObject: fail, getObject: fail, headObject: fail, deleteObject: fail, listKeys: fail, ensureBucket: fail, close() {} };
}
