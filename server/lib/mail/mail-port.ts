// Outgoing mail as a port: use cases say what to send by writing it to the outbox (outbox.ts) inside their
// own transaction; the outbox sender hands each message to an adapter after the commit. Adapters: SMTP
// (nodemailer, into the local sink in development) and in-memory (tests).

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  /** The same content as HTML; every user-typed value already escaped (server/lib/mail/compose.ts). */
  html?: string;
  /**
   * Stable id of this message (the outbox row id). Adapters pass it on as the Message-ID, so a message sent
   * twice after a crash between "sent" and "marked sent" is recognisable as one by the receiver.
   */
  id?: string;
}

export interface MailPort {
  /** Resolves once the mail server accepted the message; rejects when it did not (the outbox retries). */
  send(msg: MailMessage): Promise<void>;
}
