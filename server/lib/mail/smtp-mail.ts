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
// The outbox row id becomes the left half of the Message-ID, so it must be an atom (RFC 5322 dot-atom text).
const MESSAGE_ID_PART = /^[A-Za-z0-9._-]{1,100}$/;

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
    if (!PLAIN_ADDRESS.test(msg.to)) throw new Error('Mail to must be one plain address');
    if (msg.id !== undefined && !MESSAGE_ID_PART.test(msg.id)) throw new Error('Mail id must be letters, digits, dots, dashes or underscores');
    const info = await this.transport.sendMail({
      from: this.options.from,
      to: { name: '', address: msg.to },
      // The same id on every attempt, so a message the outbox sends twice after a crash is one message.
      messageId: msg.id === undefined ? undefined : `<${msg.id}@${this.options.from.address.split('@')[1]}>`,
      subject: msg.subject,
      text: msg.text,
      html: msg.html,
    });
    // nodemailer resolves when the server took at least one recipient; we send to exactly one.
    if ((info.rejected ?? []).length > 0) throw new Error('The mail server refused the recipient');
  }
}
