import { mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import S3rver from 's3rver'
import type { Env } from '../env.ts'

export interface FakeS3 {
  /** The settings that point the clip store at the fake. */
  vars: {
    S3_ENDPOINT: string
    S3_BUCKET: string
    S3_REGION: string
    S3_ACCESS_KEY_ID: string
    S3_SECRET_ACCESS_KEY: string
    S3_FORCE_PATH_STYLE: 'true'
  }
  close(): Promise<void>
}

const bucket = 'twofold-clips'

/**
 * A local S3-compatible server on 127.0.0.1 for development and tests, holding its objects in
 * `directory` (kept across runs) or in a temporary folder removed on close. Never used in
 * production, which takes a bucket from the settings.
 */
export async function startFakeS3(directory?: string): Promise<FakeS3> {
  const folder = directory ?? mkdtempSync(join(tmpdir(), 'twofold-s3-'))
  const server = new S3rver({
    port: 0,
    address: '127.0.0.1',
    directory: folder,
    silent: true,
    configureBuckets: [{ name: bucket }],
  })
  const { port } = await server.run()
  return {
    vars: {
      S3_ENDPOINT: `http://127.0.0.1:${port}`,
      S3_BUCKET: bucket,
      S3_REGION: 'us-east-1',
      // The fake's own fixed key pair: it accepts only these.
      S3_ACCESS_KEY_ID: 'S3RVER',
      S3_SECRET_ACCESS_KEY: 'S3RVER',
      S3_FORCE_PATH_STYLE: 'true',
    },
    async close() {
      await server.close()
      if (!directory) rmSync(folder, { recursive: true, force: true })
    },
  }
}

/**
 * The clip storage of `npm start`, `npm run dev` and the browser tests: the settings' bucket
 * when one is set (or clips are off), else a local fake keeping its objects in `directory`.
 */
export async function localClipStorage<E extends Env>(
  env: E,
  directory?: string,
): Promise<{ env: E; fake?: FakeS3 }> {
  if (!env.CLIPS_ENABLED || env.S3_BUCKET) return { env }
  const fake = await startFakeS3(directory)
  const { S3_ENDPOINT, S3_BUCKET, S3_REGION, S3_ACCESS_KEY_ID, S3_SECRET_ACCESS_KEY } = fake.vars
  return {
    env: {
      ...env,
      S3_ENDPOINT,
      S3_BUCKET,
      S3_REGION,
      S3_ACCESS_KEY_ID,
      S3_SECRET_ACCESS_KEY,
      S3_FORCE_PATH_STYLE: true,
    },
    fake,
  }
}
