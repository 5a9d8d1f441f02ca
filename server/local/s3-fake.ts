// The S3 fake for local use and tests: s3rver on 127.0.0.1 with files under the project folder.
import { mkdirSync } from 'node:fs';
import { CreateBucketCommand, HeadBucketCommand, PutBucketCorsCommand, S3Client } from '@aws-sdk/client-s3';
import S3rver from 's3rver';

export interface S3FakeHandle {
  endpoint: string;
  stop: () => Promise<void>;
}

/** Starts s3rver on `port` storing into `dir`, and makes sure `bucket` exists. */
export async function startS3Fake(opts: {
  dir: string;
  port: number;
  bucket: string;
}): Promise<S3FakeHandle> {
  mkdirSync(opts.dir, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: opts.port,
    directory: opts.dir,
    silent: true,
    configureBuckets: [],
  });
  await server.run();
  const endpoint = `http://127.0.0.1:${opts.port}`;
  const client = new S3Client({
    endpoint,
    region: 'us-east-1',
    forcePathStyle: true,
    credentials: { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' },
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  });
  try {
    await client.send(new HeadBucketCommand({ Bucket: opts.bucket }));
  } catch {
    await client.send(new CreateBucketCommand({ Bucket: opts.bucket }));
  }
  await client.send(
    new PutBucketCorsCommand({
      Bucket: opts.bucket,
      CORSConfiguration: {
        CORSRules: [
          {
            AllowedOrigins: ['*'],
            AllowedMethods: ['GET', 'PUT', 'HEAD'],
            AllowedHeaders: ['*'],
            ExposeHeaders: ['ETag'],
          },
        ],
      },
    }),
  );
  client.destroy();
  return { endpoint, stop: () => server.close() };
}
