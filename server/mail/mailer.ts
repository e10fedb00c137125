import nodemailer from 'nodemailer'
import type { Logger } from 'pino'
import { EnvError, type Env } from '../env.ts'
import { startFakeSmtp, type FakeSmtp } from './fake-smtp.ts'
import { startMailViewer, type MailViewer } from './mail-viewer.ts'

export interface Mail {
  to: string
  subject: string
  text: string
  /** A stable id, so a receiver can tell a message sent twice after a crash. */
  messageId?: string
}

export interface Mailer {
  send(mail: Mail): Promise<void>
  /** The local fake server when no provider is configured (development and tests). */
  fake?: FakeSmtp
  /** The loopback-only page that shows the fake's messages; never in production. */
  viewer?: MailViewer
  close(): Promise<void>
}

/**
 * How long a send waits on the provider (ms): to connect, for its greeting, and through any
 * silence on the socket; the defaults are minutes. Settings in `SMTP_URL`'s query win.
 */
const smtpTimeouts = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 20_000 }

/**
 * The most one send may take, whatever the provider does (ms). Well under the mail job's expiry
 * (`mailJobExpirySeconds`), so a send has always ended before another worker may take the job
 * over: a message is never handed to the provider twice by two workers at once.
 */
export const mailSendLimitMs = 45_000

/** Mail over SMTP: to `SMTP_URL` when set, else to a local fake server started here. */
export async function createMailer(
  env: Pick<Env, 'SMTP_URL' | 'MAIL_FROM' | 'NODE_ENV' | 'MAIL_VIEWER_PORT'>,
  logger?: Logger,
): Promise<Mailer> {
  if (!env.SMTP_URL && env.NODE_ENV === 'production') {
    throw new EnvError('Invalid environment:\n  SMTP_URL: required in production')
  }
  const fake = env.SMTP_URL ? undefined : await startFakeSmtp()
  const viewer = fake ? await startMailViewer(fake, env.MAIL_VIEWER_PORT) : undefined
  const transport = env.SMTP_URL
    ? nodemailer.createTransport({ url: env.SMTP_URL, ...smtpTimeouts })
    : nodemailer.createTransport({
        ...smtpTimeouts,
        host: '127.0.0.1',
        port: fake!.port,
        secure: false,
        ignoreTLS: true,
      })
  if (viewer) logger?.info({ url: viewer.url }, 'local fake mail: messages appear in the viewer')
  return {
    fake,
    viewer,
    async send(mail) {
      await transport.sendMail({
        from: env.MAIL_FROM,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        messageId: mail.messageId,
        signal: AbortSignal.timeout(mailSendLimitMs),
      })
      logger?.info({ subject: mail.subject }, 'mail sent')
    },
    async close() {
      transport.close()
      await viewer?.close()
      await fake?.close()
    },
  }
}
