// Where object storage is. A deployment sets WORLDSHEET_S3_ENDPOINT (or leaves it unset to use the
// provider's default endpoint with the SDK's usual credential chain) and WORLDSHEET_S3_BUCKET; the
// demo and the tests run the local S3-compatible fake (lib/storage/fake-server.ts) on loopback.
// The values come from lib/config.ts; `env`, when given, is parsed instead.
import { settingsOf, type Environment } from '@/lib/config';

export interface StorageConfig {
  endpoint: string | undefined;
  bucket: string;
  region: string;
  credentials: { accessKeyId: string; secretAccessKey: string } | undefined;
  forcePathStyle: boolean;
}

/** Credentials the local fake accepts (it accepts only these). */
export const FAKE_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' };
export const DEFAULT_BUCKET = 'worldsheet';

export function storageConfig(env?: Environment): StorageConfig {
  const settings = settingsOf(env);
  const endpoint = settings.WORLDSHEET_S3_ENDPOINT;
  const keyId = settings.WORLDSHEET_S3_ACCESS_KEY_ID;
  const secret = settings.WORLDSHEET_S3_SECRET_ACCESS_KEY;
  return {
    endpoint,
    bucket: settings.WORLDSHEET_S3_BUCKET ?? DEFAULT_BUCKET,
    region: settings.WORLDSHEET_S3_REGION,
    credentials: keyId && secret ? { accessKeyId: keyId, secretAccessKey: secret } : undefined,
    // Self-hosted S3-compatible stores are addressed by path (http://host:port/bucket/key).
    forcePathStyle: endpoint !== undefined,
  };
}
