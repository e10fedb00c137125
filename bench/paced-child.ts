import http from 'node:http'
import { clock, type PacedResponse } from './clock.ts'

/**
 * The sender behind `paced` (load.ts), in a process of its own so that what the benchmark does
 * meanwhile (polling the database, starting processes) never delays a response's timing: GETs
 * `argv[2]` at `argv[3]` requests a second, each on time whether or not the earlier ones were
 * answered, over kept-alive connections. Told 'stop' over its channel, it sends no more, waits
 * for every answer, hands them back and exits; it exits as well should its parent go first.
 */
const url = process.argv[2]!
const perSecond = Number(process.argv[3])

const agent = new http.Agent({ keepAlive: true, maxSockets: 64 })
const responses: PacedResponse[] = []
const pending = new Set<Promise<void>>()

const send = () => {
  const start = clock()
  const done = new Promise<void>((resolve) => {
    const attempt = () => {
      const req = http.get(url, { agent }, (res) => {
        res.resume()
        res.on('end', () => {
          const at = clock()
          responses.push({ at, ms: at - start, status: res.statusCode ?? 0 })
          resolve()
        })
      })
      req.on('error', (err: NodeJS.ErrnoException) => {
        // A kept-alive socket the server closed as the request went out: sent again on a new
        // one, as browsers do, and timed from the first send.
        if (req.reusedSocket && err.code === 'ECONNRESET') return attempt()
        const at = clock()
        responses.push({ at, ms: at - start, status: 0, error: err.code ?? err.message })
        resolve()
      })
    }
    attempt()
  })
  pending.add(done)
  void done.then(() => pending.delete(done))
}

const timer = setInterval(send, 1000 / perSecond)
process.on('disconnect', () => process.exit(0))
process.on('message', (message) => {
  if (message !== 'stop') return
  clearInterval(timer)
  void Promise.all(pending).then(() => {
    agent.destroy()
    process.send!(responses, () => process.exit(0))
  })
})
process.send!('ready')
