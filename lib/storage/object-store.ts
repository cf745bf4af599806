// Object storage through the S3 SDK: files are written once under a key derived from their SHA-256
// and read back whole. Nothing overwrites: records that cite a file by its hash must always find the
// same bytes. `discard` exists only for a duplicate that no record cites (a losing concurrent run).
import { createHash } from 'node:crypto';
import {
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  ListObjectsV2Command,
  PutObjectCommand,
  S3Client,
  S3ServiceException,
} from '@aws-sdk/client-s3';
import { AppError } from '@/lib/errors/app-error';
import { storageConfig, type StorageConfig } from './config';

export interface ObjectStore {
  readonly bucket: string;
  /** Stores `body` under `key` unless an object is already there; returns whether it wrote. */
  putOnce(key: string, body: Uint8Array, contentType: string): Promise<boolean>;
  /** The whole object, or null when there is none. */
  get(key: string): Promise<Buffer | null>;
  exists(key: string): Promise<boolean>;
  /** Keys under a prefix, sorted. */
  list(prefix: string): Promise<string[]>;
  /** Removes an object that no record cites. */
  discard(key: string): Promise<void>;
}

const unreachable = (error: unknown): AppError => {
  console.error('object storage:', error instanceof Error ? error.message : error);
  return new AppError(
    'unavailable',
    'The file store cannot be reached just now; nothing was changed. Try again in a minute.',
  );
};

const isNotFound = (error: unknown) =>
  error instanceof S3ServiceException &&
  (error.name === 'NotFound' || error.name === 'NoSuchKey' || error.$metadata?.httpStatusCode === 404);

export function createObjectStore(config: StorageConfig): ObjectStore {
  const client = new S3Client({
    endpoint: config.endpoint,
    region: config.region,
    credentials: config.credentials,
    forcePathStyle: config.forcePathStyle,
    maxAttempts: 3,
  });
  const bucket = config.bucket;

  async function exists(key: string): Promise<boolean> {
    try {
      await client.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
      return true;
    } catch (error) {
      if (isNotFound(error)) return false;
      throw unreachable(error);
    }
  }

  return {
    bucket,
    exists,
    async putOnce(key, body, contentType) {
      if (await exists(key)) return false;
      try {
        await client.send(
          new PutObjectCommand({
            Bucket: bucket,
            Key: key,
            Body: body,
            ContentType: contentType,
            ContentMD5: createHash('md5').update(body).digest('base64'),
          }),
        );
        return true;
      } catch (error) {
        throw unreachable(error);
      }
    },
    async list(prefix) {
      try {
        const out = await client.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: prefix }));
        return (out.Contents ?? []).map((o) => o.Key!).sort();
      } catch (error) {
        throw unreachable(error);
      }
    },
    async discard(key) {
      try {
        await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
      } catch (error) {
        throw unreachable(error);
      }
    },
    async get(key) {
      try {
        const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
        return Buffer.from(await out.Body!.transformToByteArray());
      } catch (error) {
        if (isNotFound(error)) return null;
        throw unreachable(error);
      }
    },
  };
}

let store: ObjectStore | null = null;

/** The app's object store, configured from the environment. */
export function getObjectStore(): ObjectStore {
  store ??= createObjectStore(storageConfig());
  return store;
}
