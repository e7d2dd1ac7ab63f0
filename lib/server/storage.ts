/**
 * Object storage for uploads (recording files, URDF files) through the AWS S3 SDK, pointed by
 * environment variables at any S3-compatible service. With no S3_ENDPOINT, the local fake on
 * 127.0.0.1:$S3_PORT is used (scripts/fakes/start.ts), with the fake's fixed development credentials.
 * Server-side only (the seed script uses it too, so it does not import "server-only").
 */
import {
  DeleteObjectCommand,
  GetObjectCommand,
  PutObjectCommand,
  S3Client,
  type PutObjectCommandInput,
  type S3ClientConfig,
} from "@aws-sdk/client-s3";
import { Upload } from "@aws-sdk/lib-storage";
import { env } from "./env";

/** s3rver's built-in development credentials; only ever sent to the loopback fake. */
const FAKE_CREDENTIALS = { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" };

let client: S3Client | undefined;
let streamingClient: S3Client | undefined;

/**
 * The client for streamed bodies: checksums only where the service requires them, so a stream is
 * sent as plain bytes of its Content-Length (not aws-chunked with a checksum trailer, which
 * S3-compatible stores such as the local fake do not all decode).
 */
function streamClient(): S3Client {
  streamingClient ??= new S3Client({ ...clientConfig(), requestChecksumCalculation: "WHEN_REQUIRED" });
  return streamingClient;
}

function storageClient(): S3Client {
  client ??= new S3Client(clientConfig());
  return client;
}

/** Where the store is and how to sign in to it, from the environment. */
function clientConfig(): S3ClientConfig {
  const e = env();
  const endpoint = e.S3_ENDPOINT ?? (e.S3_PORT ? `http://127.0.0.1:${e.S3_PORT}` : undefined);
  const loopback = endpoint !== undefined && ["127.0.0.1", "localhost", "[::1]"].includes(new URL(endpoint).hostname);
  const credentials =
    e.S3_ACCESS_KEY_ID && e.S3_SECRET_ACCESS_KEY
      ? { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY }
      : loopback
        ? FAKE_CREDENTIALS
        : undefined; // the SDK's default chain (instance roles and the like)
  return { region: e.S3_REGION, endpoint, forcePathStyle: e.S3_FORCE_PATH_STYLE, credentials };
}

export async function putObject(key: string, body: Uint8Array, contentType: string): Promise<void> {
  await storageClient().send(
    new PutObjectCommand({
      Bucket: env().S3_BUCKET,
      Key: key,
      Body: body,
      ContentType: contentType,
      ContentLength: body.byteLength,
    }),
  );
}

/**
 * An object's bytes as they arrive from the store, for reading a large file through once without
 * holding it (a second scan pass of an upload).
 */
export async function* getObjectChunks(key: string, signal?: AbortSignal): AsyncGenerator<Uint8Array> {
  const res = await storageClient().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }), {
    abortSignal: signal,
  });
  if (!res.Body) throw new Error(`object ${key} has no body`);
  // in Node the body is the HTTP response stream, an async iterable of Buffers
  for await (const chunk of res.Body as AsyncIterable<Uint8Array>) yield chunk;
}

export async function getObject(key: string): Promise<Uint8Array> {
  const res = await storageClient().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
  if (!res.Body) throw new Error(`object ${key} has no body`);
  return res.Body.transformToByteArray();
}

/** Bytes `start` … `end` − 1 of an object, by an HTTP range read (RFC 9110 §14.1.2), for reading part of a large file. */
export async function getObjectRange(key: string, start: number, end: number): Promise<Uint8Array> {
  const res = await storageClient().send(
    new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key, Range: `bytes=${start}-${end - 1}` }),
  );
  if (!res.Body) throw new Error(`object ${key} has no body`);
  const bytes = await res.Body.transformToByteArray();
  if (bytes.byteLength !== end - start)
    throw new Error(`object ${key}: asked for ${end - start} bytes at ${start}, got ${bytes.byteLength}`);
  return bytes;
}

export async function deleteObject(key: string): Promise<void> {
  await storageClient().send(new DeleteObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
}

/**
 * Streams a body of known length into the store without holding it whole (dataset uploads). The
 * store receives exactly `contentLength` bytes or the put fails; the caller removes the object if
 * it then finds the body wrong.
 */
export async function putObjectStream(
  key: string,
  body: NodeJS.ReadableStream,
  contentLength: number,
  contentType: string,
  signal?: AbortSignal,
): Promise<void> {
  await streamClient().send(
    new PutObjectCommand({
      Bucket: env().S3_BUCKET,
      Key: key,
      Body: body as PutObjectCommandInput["Body"],
      ContentType: contentType,
      ContentLength: contentLength,
    }),
    { abortSignal: signal },
  );
}

/** Bytes of one part of a streamed upload of unknown length: S3's smallest part (5 MiB; the last may be smaller). */
export const UPLOAD_PART_BYTES = 5 * 1024 * 1024;

/**
 * Streams a body of unknown length (a chunked request) into the store as an S3 multipart upload
 * (CreateMultipartUpload, UploadPart, CompleteMultipartUpload) through the SDK's `Upload`, one
 * part in memory at a time; a body under one part is sent as a single put. If the body fails (too
 * long, cut), the multipart upload is aborted and its parts dropped, so no object appears.
 */
export async function putObjectStreamUnknownLength(
  key: string,
  body: NodeJS.ReadableStream,
  contentType: string,
): Promise<void> {
  // a failing body fails the part being read, and Upload then sends AbortMultipartUpload before
  // done() rejects (Upload.abort() instead would reject at once and abort the parts later)
  const upload = new Upload({
    client: streamClient(),
    params: {
      Bucket: env().S3_BUCKET,
      Key: key,
      Body: body as PutObjectCommandInput["Body"],
      ContentType: contentType,
    },
    partSize: UPLOAD_PART_BYTES,
    queueSize: 1,
    leavePartsOnError: false,
  });
  await upload.done();
}
