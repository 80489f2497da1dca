import type { MailMessage, MailPort } from './mail-port';

/**
 * Keeps sent mail in a list: tests read `outbox`; in development `onSend` can print a line per message.
 * `keep` bounds the list so a long-running process does not hold every message it ever sent.
 */
export class MemoryMail implements MailPort {
  readonly outbox: MailMessage[] = [];

  constructor(
    private readonly onSend?: (msg: MailMessage) => void,
    private readonly keep = Number.POSITIVE_INFINITY,
  ) {}

  async send(msg: MailMessage): Promise<void> {
    this.outbox.push({ ...msg });
    if (this.outbox.length > this.keep) this.outbox.splice(0, this.outbox.length - this.keep);
    this.onSend?.(msg);
  }

  /** Messages to one address, oldest first. */
  to(address: string): MailMessage[] {
    return this.outbox.filter((m) => m.to === address);
  }

  clear(): void {
    this.outbox.length = 0;
  }
}
