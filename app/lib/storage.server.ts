// Object storage through the AWS SDK: the same code talks to the local fake and to real S3.
import {
  CreateBucketCommand,
  GetObjectCommand,
  HeadBucketCommand,
  PutObjectCommand,
  S3Client,
  NoSuchKey,
} from "@aws-sdk/client-s3";
import { config } from "./config.server";
import { describeError, DependencyUnavailableError, isNetworkError } from "./dependencies";

process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";

let client: S3Client | undefined;
export function s3(): S3Client {
  if (!client) {
    const c = config();
    client = new S3Client({
      endpoint: c.S3_ENDPOINT,
      region: c.S3_REGION,
      forcePathStyle: c.S3_FORCE_PATH_STYLE,
      credentials: { accessKeyId: c.S3_ACCESS_KEY_ID, secretAccessKey: c.S3_SECRET_ACCESS_KEY },
      // the fake stores aws-chunked framing verbatim otherwise
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
    });
  }
  return client;
}

export async function ensureBucket(): Promise<void> {
  const Bucket = config().S3_BUCKET;
  try {
    await s3().send(new HeadBucketCommand({ Bucket }));
  } catch {
    await s3().send(new CreateBucketCommand({ Bucket }));
  }
}

/** A store that does not answer, or answers 5xx, is unavailable; anything else is a real error. */
function storageError(e: unknown): unknown {
  const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
  if (isNetworkError(e) || (status !== undefined && status >= 500)) return new DependencyUnavailableError("storage", describeError(e));
  return e;
}

export async function putObject(key: string, body: string | Uint8Array, contentType: string): Promise<void> {
  try {
    await s3().send(new PutObjectCommand({ Bucket: config().S3_BUCKET, Key: key, Body: body, ContentType: contentType }));
  } catch (e) {
    throw storageError(e);
  }
}

/** The object's bytes, or null when there is no such key. */
export async function getObject(key: string): Promise<Uint8Array | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: config().S3_BUCKET, Key: key }));
    return out.Body ? await out.Body.transformToByteArray() : new Uint8Array();
  } catch (e) {
    if (e instanceof NoSuchKey || (e as { name?: string }).name === "NoSuchKey") return null;
    throw storageError(e);
  }
}

/**
 * The object as a stream with its length, or null when there is no such key: for downloads,
 * which pass the stored bytes on as they arrive instead of holding a whole result in memory.
 * A store that stops answering mid-way cuts the download short (the status is sent by then).
 */
export async function getObjectStream(key: string): Promise<{ body: ReadableStream<Uint8Array>; length: number | null } | null> {
  try {
    const out = await s3().send(new GetObjectCommand({ Bucket: config().S3_BUCKET, Key: key }));
    const body = out.Body ? (out.Body.transformToWebStream() as ReadableStream<Uint8Array>) : new Blob([]).stream();
    return { body, length: out.ContentLength ?? null };
  } catch (e) {
    if (e instanceof NoSuchKey || (e as { name?: string }).name === "NoSuchKey") return null;
    throw storageError(e);
  }
}

export async function getText(key: string): Promise<string | null> {
  const bytes = await getObject(key);
  return bytes ? new TextDecoder().decode(bytes) : null;
}
