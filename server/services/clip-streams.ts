import { Readable } from 'node:stream'

/**
 * The first `n` bytes of a stream (fewer if it ends sooner), leaving the stream paused with
 * the rest unread; `rest` gives the whole stream again, those bytes first.
 */
export function takeHead(stream: Readable, n: number): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    // Already read to its end (a JSON body the JSON parser took): no bytes will come, nor 'end'.
    if (stream.readableEnded) return resolve(Buffer.alloc(0))
    const chunks: Buffer[] = []
    let got = 0
    const finish = () => {
      stream.off('data', onData)
      stream.off('end', finish)
      stream.off('error', onError)
      stream.pause()
      resolve(Buffer.concat(chunks))
    }
    const onData = (chunk: Buffer) => {
      chunks.push(chunk)
      got += chunk.length
      if (got >= n) finish()
    }
    const onError = (err: Error) => {
      stream.off('data', onData)
      stream.off('end', finish)
      reject(err)
    }
    stream.on('data', onData)
    stream.once('end', finish)
    stream.once('error', onError)
  })
}

/** The stream again from its start, given the head already taken from it. */
export function withHead(head: Buffer, stream: Readable): Readable {
  return Readable.from(
    (async function* () {
      yield head
      for await (const chunk of stream) yield chunk as Buffer
    })(),
  )
}
