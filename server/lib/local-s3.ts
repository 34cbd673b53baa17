/**
 * The local fake S3 server (s3rver) that stands in for the hosted object store in dev and in tests,
 * when S3_ENDPOINT is unset: loopback only, files kept in a folder of ours, fixed fake credentials, the
 * bucket created at start.
 */
import fs from 'node:fs/promises';
import S3rver from 's3rver';
import type { StorageOptions } from './storage';

/** s3rver accepts any signature made with these (its documented defaults). */
export const LOCAL_S3_CREDENTIALS = { accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' } as const;
export const LOCAL_S3_REGION = 'us-east-1';

export interface LocalS3 {
  port: number;
  endpoint: string;
  /** Ready-made options for createStorage(). */
  storageOptions: StorageOptions;
  close(): Promise<void>;
}

export async function startLocalS3(options: { directory: string; bucket: string; port?: number }): Promise<LocalS3> {
  await fs.mkdir(options.directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port: options.port ?? 0,
    silent: true,
    directory: options.directory,
    // Path-style only: vhost matching would read "127.0.0.1" as a bucket name.
    vhostBuckets: false,
    configureBuckets: [{ name: options.bucket }],
  });
  const address = await server.run();
  const endpoint = `http://127.0.0.1:${address.port}`;
  let closed = false;
  return {
    port: address.port,
    endpoint,
    storageOptions: { endpoint, bucket: options.bucket, region: LOCAL_S3_REGION, ...LOCAL_S3_CREDENTIALS },
    async close() {
      if (closed) return;
      closed = true;
      const closing = server.close();
      // The SDK keeps connections alive; without this, close() waits for them to time out.
      server.httpServer?.closeAllConnections();
      await closing;
    },
  };
}
