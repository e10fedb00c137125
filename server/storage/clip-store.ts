import type { Readable } from 'node:stream'
import {
  DeleteObjectsCommand,
  GetObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'
import type { Env } from '../env.ts'

/** Where clip videos are kept: one object per clip, keyed by club and clip. */
export interface ClipStore {
  /** Streams `length` bytes into the object; rejects if the stream fails or ends short. */
  put(key: string, body: Readable, length: number, contentType: string): Promise<void>
  /** The object's bytes from `start` to `end`, both included. */
  get(key: string, start: number, end: number): Promise<Readable>
  /** Deletes the objects; a missing one is not an error. */
  remove(keys: string[]): Promise<void>
}

/** How long one request deleting objects may take (ms), so that a hung store holds nothing. */
const removeTimeoutMs = 20_000

export const clipObjectKey = (clubId: string, clipId: string) => `clubs/${clubId}/clips/${clipId}`

/**
 * The clip store of these settings: an S3 bucket through the AWS SDK, or none when clips are
 * turned off or no bucket is set (development without the local fake: the routes answer 503).
 */
export function createClipStore(
  env: Pick<
    Env,
    | 'CLIPS_ENABLED'
    | 'S3_BUCKET'
    | 'S3_ENDPOINT'
    | 'S3_REGION'
    | 'S3_ACCESS_KEY_ID'
    | 'S3_SECRET_ACCESS_KEY'
    | 'S3_FORCE_PATH_STYLE'
  >,
): ClipStore | null {
  if (!env.CLIPS_ENABLED || !env.S3_BUCKET) return null
  const bucket = env.S3_BUCKET
  const client = new S3Client({
    region: env.S3_REGION,
    endpoint: env.S3_ENDPOINT,
    forcePathStyle: env.S3_FORCE_PATH_STYLE,
    credentials:
      env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY
        ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY }
        : undefined,
    // A body streamed with its length, as S3-compatible stores other than AWS's accept it; the
    // flexible checksums would send it in aws-chunked encoding, which many of them refuse.
    requestChecksumCalculation: 'WHEN_REQUIRED',
    responseChecksumValidation: 'WHEN_REQUIRED',
  })
  return {
    async put(key, body, length, contentType) {
      await client.send(
        new PutObjectCommand({
          Bucket: bucket,
          Key: key,
          Body: body,
          ContentLength: length,
          ContentType: contentType,
        }),
      )
    },
    async get(key, start, end) {
      const object = await client.send(
        new GetObjectCommand({ Bucket: bucket, Key: key, Range: `bytes=${start}-${end}` }),
      )
      return object.Body as Readable
    },
    async remove(keys) {
      // DeleteObjects takes up to 1,000 keys a request. Every batch is tried, whatever an
      // earlier one met; what was refused (the whole request, or some keys in a request that
      // succeeded) is told at the end.
      const refused: string[] = []
      for (let i = 0; i < keys.length; i += 1000) {
        const batch = keys.slice(i, i + 1000)
        try {
          const { Errors } = await client.send(
            new DeleteObjectsCommand({
              Bucket: bucket,
              Delete: { Objects: batch.map((Key) => ({ Key })), Quiet: true },
            }),
            { abortSignal: AbortSignal.timeout(removeTimeoutMs) },
          )
          for (const e of Errors ?? []) refused.push(`${e.Key}: ${e.Code}`)
        } catch (err) {
          refused.push(`${batch.length} object(s): ${(err as Error).message}`)
        }
      }
      if (refused.length > 0) {
        throw new Error(`clip objects not deleted: ${refused.slice(0, 3).join('; ')}`)
      }
    },
  }
}
