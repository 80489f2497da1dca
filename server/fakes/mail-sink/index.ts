import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { simpleParser } from 'mailparser';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { sinkApp } from './http';
import { toSinkMessage } from './message';
import { MailStore } from './store';

// The local stand-in for a mail provider: an SMTP server (smtp-server) that accepts every message, parses it
// with mailparser and keeps it, and an HTTP server with the inbox page and the catchers' JSON API.
// It listens on loopback only and does not authenticate: nothing it receives is delivered anywhere.

export interface MailSinkOptions {
  /** 0 picks a free port (tests). */
  smtpPort: number;
  uiPort: number;
  /** Default 127.0.0.1. */
  host?: string;
  /** Keeps the inbox in DATA folder/messages.json across restarts; memory only without it. */
  dataDir?: string;
  maxMessages?: number;
  log?: (line: string) => void;
}

export interface MailSink {
  host: string;
  smtpPort: number;
  uiPort: number;
  close: () => Promise<void>;
}

/** Bigger than any mail Fieldfold sends (PDFs go as links, not attachments); larger messages get 552. */
export const MAX_MESSAGE_BYTES = 10 * 1024 * 1024;

function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    stream.on('data', (c: Buffer) => chunks.push(c));
    stream.on('error', reject);
    stream.on('end', () => resolve(Buffer.concat(chunks)));
  });
}

function smtpError(message: string, responseCode: number): Error {
  return Object.assign(new Error(message), { responseCode });
}

export async function startMailSink(options: MailSinkOptions): Promise<MailSink> {
  const host = options.host ?? '127.0.0.1';
  const log = options.log ?? (() => {});
  const store = MailStore.open({
    dataDir: options.dataDir,
    maxMessages: options.maxMessages ?? 500,
    maxBytes: 100 * 1024 * 1024,
    log,
  });

  const smtp = new SMTPServer({
    name: 'fieldfold-mail-sink',
    banner: 'Fieldfold local mail sink',
    // No TLS and no AUTH on loopback; clients that send credentials are not asked for them.
    disabledCommands: ['AUTH', 'STARTTLS'],
    authOptional: true,
    disableReverseLookup: true,
    logger: false,
    size: MAX_MESSAGE_BYTES,
    closeTimeout: 2_000,
    onData(stream: SMTPServerDataStream, session: SMTPServerSession, callback: (err?: Error | null, message?: string) => void) {
      readAll(stream)
        .then(async (raw) => {
          if (stream.sizeExceeded) throw smtpError('Message exceeds the fixed maximum message size', 552);
          const parsed = await simpleParser(raw, { skipImageLinks: true });
          const message = toSinkMessage(raw, parsed, { mailFrom: session.envelope.mailFrom, rcptTo: session.envelope.rcptTo, helo: session.hostNameAppearsAs || '' }, new Date());
          store.add(message);
          // JSON quoting keeps whatever a subject holds on this one log line; addresses stay out of logs.
          log(`[mail-sink] ${message.ID} ${JSON.stringify(message.Parsed.Subject)}`);
          callback(null, `Queued as ${message.ID}`);
        })
        .catch((err: Error) => callback(err));
    },
  });
  smtp.on('error', (err) => log(`[mail-sink] SMTP: ${err.message}`));

  const smtpPort = await new Promise<number>((resolve, reject) => {
    const onError = (err: Error) => reject(err);
    smtp.server.once('error', onError);
    smtp.listen(options.smtpPort, host, () => {
      smtp.server.off('error', onError);
      resolve((smtp.server.address() as AddressInfo).port);
    });
  });

  let http: Server;
  try {
    http = await new Promise<Server>((resolve, reject) => {
      const server = sinkApp(store, log).listen(options.uiPort, host);
      server.once('error', reject);
      server.once('listening', () => {
        server.off('error', reject);
        resolve(server);
      });
    });
  } catch (err) {
    await new Promise<void>((r) => smtp.close(() => r()));
    throw err;
  }

  let closing: Promise<void> | null = null;
  return {
    host,
    smtpPort,
    uiPort: (http.address() as AddressInfo).port,
    close: () =>
      (closing ??= (async () => {
        await Promise.all([
          new Promise<void>((r) => smtp.close(() => r())),
          new Promise<void>((r) => {
            http.close(() => r());
            http.closeAllConnections();
          }),
        ]);
        await store.flush();
      })()),
  };
}
