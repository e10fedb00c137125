import nodemailer from 'nodemailer'
import type { Logger } from 'pino'
import type { Env } from '../env.ts'
import { startFakeSmtp, type FakeSmtp } from './fake-smtp.ts'

export interface Mail {
  to: string
  subject: string
  text: string
}

export interface Mailer {
  send(mail: Mail): Promise<void>
  /** The local fake server when no provider is configured (development and tests). */
  fake?: FakeSmtp
  close(): Promise<void>
}

/** Mail over SMTP: to `SMTP_URL` when set, else to a local fake server started here. */
export async function createMailer(
  env: Pick<Env, 'SMTP_URL' | 'MAIL_FROM'>,
  logger?: Logger,
): Promise<Mailer> {
  const fake = env.SMTP_URL ? undefined : await startFakeSmtp()
  const transport = env.SMTP_URL
    ? nodemailer.createTransport(env.SMTP_URL)
    : nodemailer.createTransport({
        host: '127.0.0.1',
        port: fake!.port,
        secure: false,
        ignoreTLS: true,
      })
  if (fake)
    logger?.info({ port: fake.port }, 'local fake mail server: messages appear on the Outbox page')
  return {
    fake,
    async send(mail) {
      await transport.sendMail({
        from: env.MAIL_FROM,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
      })
      logger?.info({ subject: mail.subject }, 'mail sent')
    },
    async close() {
      transport.close()
      await fake?.close()
    },
  }
}
