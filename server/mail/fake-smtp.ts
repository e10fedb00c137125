import { randomUUID } from 'node:crypto'
import type { AddressInfo } from 'node:net'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'
import type { OutboxMessage } from '../../shared/schemas/auth.ts'

const keep = 500

export interface FakeSmtp {
  port: number
  /** Newest first. */
  messages(): OutboxMessage[]
  /** Resolves with the first message to `to` received from now on (or already received). */
  waitFor(to: string, timeoutMs?: number): Promise<OutboxMessage>
  close(): Promise<void>
}

/**
 * A local SMTP server on 127.0.0.1 that keeps what it receives in memory: it stands in for a
 * mail provider in development and tests, so that mail goes through real SMTP end to end.
 */
export async function startFakeSmtp(): Promise<FakeSmtp> {
  const received: OutboxMessage[] = []
  const waiters: { to: string; resolve: (m: OutboxMessage) => void }[] = []

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Twofold local mail',
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const to = session.envelope.rcptTo.map((r) => r.address.toLowerCase())
          const message: OutboxMessage = {
            id: randomUUID(),
            to,
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            receivedAt: new Date().toISOString(),
          }
          received.unshift(message)
          received.splice(keep)
          for (const waiter of [...waiters]) {
            if (to.includes(waiter.to)) {
              waiters.splice(waiters.indexOf(waiter), 1)
              waiter.resolve(message)
            }
          }
          callback()
        })
        .catch((err: Error) => callback(err))
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(0, '127.0.0.1', () => resolve())
  })
  const port = (server.server.address() as AddressInfo).port

  return {
    port,
    messages: () => [...received],
    waitFor(to, timeoutMs = 10_000) {
      const address = to.toLowerCase()
      const already = received.find((m) => m.to.includes(address))
      if (already) return Promise.resolve(already)
      return new Promise((resolve, reject) => {
        const timer = setTimeout(
          () => reject(new Error(`no mail to ${address} within ${timeoutMs} ms`)),
          timeoutMs,
        )
        waiters.push({
          to: address,
          resolve: (m) => {
            clearTimeout(timer)
            resolve(m)
          },
        })
      })
    },
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  }
}
