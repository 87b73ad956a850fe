// Local S3-compatible object store (s3rver) for development and tests. The app reaches it only
// through @aws-sdk/client-s3, exactly as it would reach real S3.
import fs from "node:fs";
import S3rver from "s3rver";

export interface S3Fake {
  url: string;
  stop(): Promise<void>;
}

export async function startS3Fake(opts: { port: number; dir: string; bucket: string; host?: string }): Promise<S3Fake> {
  fs.mkdirSync(opts.dir, { recursive: true });
  const host = opts.host ?? "127.0.0.1";
  const server = new S3rver({
    port: opts.port,
    address: host,
    directory: opts.dir,
    silent: true,
    configureBuckets: [{ name: opts.bucket, configs: [] }],
  });
  await server.run();
  let stopped: Promise<void> | undefined;
  return {
    url: `http://${host}:${opts.port}`,
    // idempotent: a test may stop the fake early to see the app notice, then clean up as usual
    stop: () => (stopped ??= server.close().then(() => undefined)),
  };
}
