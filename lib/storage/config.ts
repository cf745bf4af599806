// Where object storage is. A deployment sets WORLDSHEET_S3_ENDPOINT (or leaves it unset to use the
// provider's default endpoint with the SDK's usual credential chain) and WORLDSHEET_S3_BUCKET; the
// demo and the tests run the local S3-compatible fake (lib/storage/fake-server.ts) on loopback.

export interface StorageConfig {
  endpoint: string | undefined;
  bucket: string;
  region: string;
  credentials: { accessKeyId: string; secretAccessKey: string } | undefined;
  forcePathStyle: boolean;
}

/** The local fake's port for `npm start` (the tests use 4578 shifted like their other ports). */
export const DEFAULT_FAKE_S3_PORT = 4568;
/** Credentials the local fake accepts (it accepts only these). */
export const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };
export const DEFAULT_BUCKET = 'worldsheet';

export function storageConfig(env: NodeJS.ProcessEnv = process.env): StorageConfig {
  const endpoint = env.WORLDSHEET_S3_ENDPOINT || undefined;
  const keyId = env.WORLDSHEET_S3_ACCESS_KEY_ID;
  const secret = env.WORLDSHEET_S3_SECRET_ACCESS_KEY;
  return {
    endpoint,
    bucket: env.WORLDSHEET_S3_BUCKET || DEFAULT_BUCKET,
    region: env.WORLDSHEET_S3_REGION || 'us-east-1',
    credentials: keyId && secret ? { accessKeyId: keyId, secretAccessKey: secret } : undefined,
    // Self-hosted S3-compatible stores are addressed by path (http://host:port/bucket/key).
    forcePathStyle: endpoint !== undefined,
  };
}
