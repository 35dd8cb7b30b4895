import { Readable } from "node:stream";
import type { S3Client } from "@aws-sdk/client-s3";
import { serverEnv } from "../env";
import { processSingleton } from "../process-singleton";

/**
 * The bucket that keeps uploaded files, through the S3 API: the same code for
 * one instance and for several behind a proxy, so any instance can read a
 * file another one received. Locally a fake S3 (`.dev/object-store.sh`).
 */

/** S3's smallest multipart part; a file streams through in pieces of this size, never whole. */
const PART_BYTES = 5 * 1024 * 1024;
/** Parts in flight at once per upload, so one upload holds at most this many parts in memory. */
const PARTS_AT_ONCE = 2;

function settings() {
  const env = serverEnv();
  return {
    url: env.PATINA_S3_URL,
    bucket: env.PATINA_S3_BUCKET,
    region: env.PATINA_S3_REGION,
    accessKeyId: env.PATINA_S3_ACCESS_KEY_ID,
    secretAccessKey: env.PATINA_S3_SECRET_ACCESS_KEY,
    forcePathStyle: env.PATINA_S3_FORCE_PATH_STYLE,
  };
}

/** The SDK loads on first use (some seconds of module loading on a busy machine), not when the server starts. */
const sdk = () => import("@aws-sdk/client-s3");

function client(): Promise<S3Client> {
  const s = settings();
  return processSingleton(`object store ${s.url} ${s.accessKeyId}`, async () => {
    // The SDK is pinned to a release that runs on Node 20; its notice about later releases is not news to operators.
    process.env.AWS_SDK_JS_NODE_VERSION_SUPPORT_WARNING_DISABLED ??= "true";
    const { S3Client } = await sdk();
    return new S3Client({
      endpoint: s.url,
      region: s.region,
      forcePathStyle: s.forcePathStyle,
      credentials: { accessKeyId: s.accessKeyId, secretAccessKey: s.secretAccessKey },
    });
  });
}

/**
 * Streams the bytes into the bucket under `key`, in parts as they arrive.
 * When the source throws, the partial upload is aborted and the error passed on.
 */
export async function putObject(key: string, body: AsyncIterable<Uint8Array>, contentType: string): Promise<void> {
  let sourceError: unknown = null;
  async function* watched() {
    try {
      yield* body;
    } catch (error) {
      sourceError = error;
      throw error;
    }
  }
  const { Upload } = await import("@aws-sdk/lib-storage");
  const upload = new Upload({
    client: await client(),
    params: { Bucket: settings().bucket, Key: key, Body: Readable.from(watched(), { objectMode: false }), ContentType: contentType },
    partSize: PART_BYTES,
    queueSize: PARTS_AT_ONCE,
    leavePartsOnError: false,
  });
  try {
    await upload.done();
  } catch (error) {
    // The source's own error (too large, client gone) matters more than how the SDK wrapped it.
    throw sourceError ?? error;
  }
}

function isStatus(error: unknown, status: number): boolean {
  return (error as { $metadata?: { httpStatusCode?: number } } | null)?.$metadata?.httpStatusCode === status;
}

/**
 * The object's bytes as they arrive; `limitBytes` reads only its start.
 * Stopping early (a `return` or `break` in the reader) closes the download.
 */
export async function* readObject(key: string, limitBytes?: number): AsyncGenerator<Uint8Array> {
  let body: Readable;
  try {
    const { GetObjectCommand } = await sdk();
    const answer = await (await client()).send(
      new GetObjectCommand({ Bucket: settings().bucket, Key: key, ...(limitBytes ? { Range: `bytes=0-${limitBytes - 1}` } : {}) }),
    );
    if (!answer.Body) return;
    body = answer.Body as Readable;
  } catch (error) {
    // A range from 0 on an empty object: there is nothing to read.
    if (limitBytes && isStatus(error, 416)) return;
    throw error;
  }
  for await (const piece of body as AsyncIterable<Uint8Array>) yield piece;
}

export async function deleteObject(key: string): Promise<void> {
  const { DeleteObjectCommand } = await sdk();
  await (await client()).send(new DeleteObjectCommand({ Bucket: settings().bucket, Key: key }));
}

/** Keys under `prefix`, in key order. */
export async function listObjectKeys(prefix: string): Promise<string[]> {
  const { ListObjectsV2Command } = await sdk();
  const keys: string[] = [];
  let token: string | undefined;
  do {
    const page = await (await client()).send(new ListObjectsV2Command({ Bucket: settings().bucket, Prefix: prefix, ContinuationToken: token }));
    for (const item of page.Contents ?? []) if (item.Key) keys.push(item.Key);
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
  return keys.sort();
}
