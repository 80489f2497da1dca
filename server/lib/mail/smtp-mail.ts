import nodemailer, { type Transporter } from 'nodemailer';
import type { MailMessage, MailPort } from './mail-port';

export interface SmtpMailOptions {
  host: string;
  port: number;
  /** The sender every message carries (MAIL_FROM), already parsed into name and address. */
  from: { name: string; address: string };
  /** Milliseconds to open the TCP connection and to wait for the server's greeting (default 3 000 each). */
  connectTimeoutMs?: number;
  /** Milliseconds of silence on an open connection before giving up (default 15 000). */
  socketTimeoutMs?: number;
}

// One plain address, no display name, no list: anything else is a bug in the caller, not a mail to try.
const PLAIN_ADDRESS = /^[^\s@<>(),;:"\\[\]]+@[^\s@<>(),;:"\\[\]]+$/;

/**
 * Sends through an SMTP server with nodemailer: the local mail sink under `npm start`, a provider's relay
 * elsewhere. Every header is built by nodemailer from data, never from text we concatenate, and addresses
 * go in as `{ name, address }` objects so a stray comma or line break cannot add a recipient. A failure
 * (server down, refused recipient, timeout) rejects: the caller's outbox decides when to try again.
 *
 * No pool: one short connection per message keeps a dead server from holding sockets, and the timeouts are
 * short so a send that cannot happen fails in seconds instead of nodemailer's default two minutes.
 */
export class SmtpMail implements MailPort {
  private readonly transport: Transporter;

  constructor(private readonly options: SmtpMailOptions) {
    const connectTimeout = options.connectTimeoutMs ?? 3_000;
    this.transport = nodemailer.createTransport({
      host: options.host,
      port: options.port,
      secure: false,
      connectionTimeout: connectTimeout,
      greetingTimeout: connectTimeout,
      socketTimeout: options.socketTimeoutMs ?? 15_000,
      // Message content never names files or URLs to fetch; refuse them if it ever does.
      disableFileAccess: true,
      disableUrlAccess: true,
    });
  }

  async send(msg: MailMessage): Promise<void> {
    for (const [field, value] of [['to', msg.to], ['replyTo', msg.replyTo]] as const) {
      if (value !== undefined && !PLAIN_ADDRESS.test(value)) throw new Error(`Mail ${field} must be one plain address`);
    }
    const info = await this.transport.sendMail({
      from: this.options.from,
      to: { name: '', address: msg.to },
      replyTo: msg.replyTo === undefined ? undefined : { name: '', address: msg.replyTo },
      subject: msg.subject,
      text: msg.text,
      html: msg.html,
    });
    // nodemailer resolves when the server took at least one recipient; we send to exactly one.
    if ((info.rejected ?? []).length > 0) throw new Error('The mail server refused the recipient');
  }
}
