import { createServer as createHttpServer, type Server as HttpServer } from 'node:http'
import type { AddressInfo } from 'node:net'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

export interface SinkMessage {
  id: number
  receivedAt: string
  from: string
  to: string[]
  subject: string
  text: string
  html: string
  attachments: { filename: string; contentType: string; content: string }[]
}

export interface SmtpSink {
  smtpPort: number
  httpPort: number
  messages: SinkMessage[]
  close(): Promise<void>
}

/**
 * A local SMTP server on 127.0.0.1 that keeps every message it receives in memory and serves
 * them as JSON (GET /messages, DELETE /messages) for the dev outbox page and the tests.
 */
export async function startSmtpSink(options: { smtpPort?: number; httpPort?: number } = {}): Promise<SmtpSink> {
  const messages: SinkMessage[] = []
  const smtp = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          messages.push({
            id: messages.length + 1,
            receivedAt: new Date().toISOString(),
            from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : '',
            // Text attachments (calendar files) are kept as text, others as base64.
            attachments: mail.attachments.map((a) => ({
              filename: a.filename ?? '',
              contentType: a.contentType,
              content: a.contentType.startsWith('text/') ? a.content.toString('utf8') : a.content.toString('base64'),
            })),
          })
          callback()
        })
        .catch((error: Error) => callback(error))
    },
  })
  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject)
    smtp.listen(options.smtpPort ?? 0, '127.0.0.1', () => resolve())
  })
  const http: HttpServer = createHttpServer((req, res) => {
    if (req.url === '/messages' && req.method === 'GET') {
      res.writeHead(200, { 'content-type': 'application/json' })
      res.end(JSON.stringify([...messages].reverse()))
    } else if (req.url === '/messages' && req.method === 'DELETE') {
      messages.length = 0
      res.writeHead(204).end()
    } else {
      res.writeHead(404).end()
    }
  })
  await new Promise<void>((resolve) => http.listen(options.httpPort ?? 0, '127.0.0.1', () => resolve()))
  return {
    smtpPort: (smtp.server.address() as AddressInfo).port,
    httpPort: (http.address() as AddressInfo).port,
    messages,
    close: () =>
      Promise.all([new Promise<void>((r) => smtp.close(() => r())), new Promise<void>((r) => http.close(() => r()))]).then(() => undefined),
  }
}
