// Outgoing mail as a port: the services say what to send, an adapter sends it. The in-memory adapter
// (memory-mail.ts) serves tests and a server without SMTP_PORT; smtp-mail.ts sends through nodemailer.

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  /** The same message as HTML (compose.ts builds both parts); mail clients show it when they can. */
  html?: string;
  replyTo?: string;
}

export interface MailPort {
  send(msg: MailMessage): Promise<void>;
}

/**
 * Sends each message on its own, after the database work is committed: a mail server that is down must
 * never undo an award or a bid. Failures are logged (subject only: addresses and bodies stay out of logs).
 */
export async function sendAll(mail: MailPort, messages: MailMessage[], log: (msg: string) => void): Promise<void> {
  for (const msg of messages) {
    try {
      await mail.send(msg);
    } catch (err) {
      log(`[mail] could not send "${msg.subject}": ${err instanceof Error ? err.message : String(err)}`);
    }
  }
}
