// Object storage through the S3 API: the local fake or any S3-compatible store.
import { HeadBucketCommand, S3Client } from '@aws-sdk/client-s3';
import type { Env } from './env';

export interface Storage {
  client: S3Client;
  bucket: string;
  check: () => Promise<void>;
  close: () => void;
}

/** Builds the S3 client from the environment; checksums only when required, as the fake needs. */
export function createStorage(env: Env): Storage {
  const client = new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  return {
    client,
    bucket: env.S3_BUCKET,
    check: async () => {
      await client.send(new HeadBucketCommand({ Bucket: env.S3_BUCKET }));
    },
    close: () => client.destroy(),
  };
}
