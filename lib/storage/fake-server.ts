// The local S3-compatible object store for the demo and the tests: s3rver on loopback, keeping its
// objects in a project-local folder. A deployment uses a real object store instead (config.ts).
import { mkdirSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
// @ts-expect-error s3rver ships no type declarations
import S3rver from 's3rver';
import { DEFAULT_BUCKET, FAKE_S3_CREDENTIALS } from './config';

export interface FakeObjectStore {
  url: string;
  bucket: string;
  /** Environment variables that point the app's object store at this server. */
  env: Record<string, string>;
  stop(): Promise<void>;
}

export async function startFakeObjectStore(options: {
  port: number;
  directory: string;
  bucket?: string;
}): Promise<FakeObjectStore> {
  const bucket = options.bucket ?? DEFAULT_BUCKET;
  mkdirSync(options.directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: options.port,
    directory: options.directory,
    silent: true,
    configureBuckets: [{ name: bucket }],
  });
  let address: AddressInfo;
  try {
    address = (await server.run()) as AddressInfo;
  } catch (error) {
    const code = (error as { code?: string }).code;
    if (code === 'EADDRINUSE') {
      throw new Error(
        `The local object store cannot listen on 127.0.0.1:${options.port}: the port is in use. Stop what uses it, or set another port.`,
        { cause: error },
      );
    }
    throw error;
  }
  const url = `http://127.0.0.1:${address.port}`;
  return {
    url,
    bucket,
    env: {
      WORLDSHEET_S3_ENDPOINT: url,
      WORLDSHEET_S3_BUCKET: bucket,
      WORLDSHEET_S3_REGION: 'us-east-1',
      WORLDSHEET_S3_ACCESS_KEY_ID: FAKE_S3_CREDENTIALS.accessKeyId,
      WORLDSHEET_S3_SECRET_ACCESS_KEY: FAKE_S3_CREDENTIALS.secretAccessKey,
    },
    stop: () => server.close(),
  };
}
