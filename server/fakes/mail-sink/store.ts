import fs from 'node:fs';
import path from 'node:path';
import { isSinkMessage, type SinkMessage } from './message';

export interface MailStoreOptions {
  /** Folder for messages.json; without one the inbox lives in memory only. */
  dataDir?: string;
  /** The oldest messages go once either bound is passed. */
  maxMessages: number;
  maxBytes: number;
  log: (line: string) => void;
}

const FILE = 'messages.json';

/**
 * The sink's inbox: newest first, bounded by count and bytes so a long `npm start` cannot grow without end,
 * and (with a data folder) written to one JSON file so a restart keeps what arrived. Writes are coalesced
 * and atomic (a temporary file renamed over the old one), so a crash mid-write leaves the previous inbox.
 */
export class MailStore {
  private messages: SinkMessage[] = []; // oldest first
  private bytes = 0;
  private writeTimer: NodeJS.Timeout | null = null;
  private writing: Promise<void> = Promise.resolve();

  private constructor(private readonly options: MailStoreOptions) {}

  static open(options: MailStoreOptions): MailStore {
    const store = new MailStore(options);
    if (options.dataDir) {
      fs.mkdirSync(options.dataDir, { recursive: true });
      store.load(path.join(options.dataDir, FILE));
    }
    return store;
  }

  private load(file: string): void {
    let text: string;
    try {
      text = fs.readFileSync(file, 'utf8');
    } catch {
      return; // first start: no inbox yet
    }
    try {
      const saved = JSON.parse(text) as { messages?: unknown };
      const list = Array.isArray(saved.messages) ? saved.messages.filter(isSinkMessage) : [];
      for (const m of list) this.push(m);
    } catch (err) {
      this.options.log(`[mail-sink] ignoring unreadable ${file}: ${err instanceof Error ? err.message : String(err)}`);
    }
  }

  private push(m: SinkMessage): void {
    this.messages.push(m);
    this.bytes += m.Content.Size;
    while (this.messages.length > 1 && (this.messages.length > this.options.maxMessages || this.bytes > this.options.maxBytes)) {
      this.bytes -= this.messages.shift()!.Content.Size;
    }
  }

  add(m: SinkMessage): void {
    this.push(m);
    this.scheduleWrite();
  }

  get total(): number {
    return this.messages.length;
  }

  /** Newest first, like the catchers' list. */
  list(start: number, limit: number): SinkMessage[] {
    const end = this.messages.length - start;
    return end <= 0 ? [] : this.messages.slice(Math.max(0, end - limit), end).reverse();
  }

  get(id: string): SinkMessage | undefined {
    return this.messages.find((m) => m.ID === id);
  }

  remove(id: string): boolean {
    const i = this.messages.findIndex((m) => m.ID === id);
    if (i < 0) return false;
    this.bytes -= this.messages[i].Content.Size;
    this.messages.splice(i, 1);
    this.scheduleWrite();
    return true;
  }

  clear(): void {
    this.messages = [];
    this.bytes = 0;
    this.scheduleWrite();
  }

  private scheduleWrite(): void {
    if (!this.options.dataDir || this.writeTimer) return;
    this.writeTimer = setTimeout(() => {
      this.writeTimer = null;
      void this.write();
    }, 100);
  }

  private write(): Promise<void> {
    const dir = this.options.dataDir;
    if (!dir) return Promise.resolve();
    const snapshot = JSON.stringify({ version: 1, messages: this.messages });
    this.writing = this.writing.then(async () => {
      const file = path.join(dir, FILE);
      const tmp = `${file}.${process.pid}.tmp`;
      try {
        await fs.promises.writeFile(tmp, snapshot);
        await fs.promises.rename(tmp, file);
      } catch (err) {
        this.options.log(`[mail-sink] could not save the inbox: ${err instanceof Error ? err.message : String(err)}`);
      }
    });
    return this.writing;
  }

  /** Writes any pending change now (on close). */
  async flush(): Promise<void> {
    if (this.writeTimer) {
      clearTimeout(this.writeTimer);
      this.writeTimer = null;
      await this.write();
    }
    await this.writing;
  }
}
