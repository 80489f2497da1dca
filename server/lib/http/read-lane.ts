// Heavy reads (the market, a block's bids, long lists) take turns: one per turn of the event loop. better-sqlite3
// runs every query on the event loop, so twenty searches that arrive together would otherwise run back to back
// while a log entry from the truck or a payment webhook waits for its body to be read behind all of them. Here
// each search runs in its own setImmediate turn, and Node serves the I/O that arrived meanwhile (poll phase)
// before the next one (check phase): a light request waits for at most one search, not for the queue.
//
// A lane orders work within one process; it never changes what a request answers.

export class ReadLane {
  private readonly queue: Array<() => Promise<void>> = [];
  private running = false;

  /** Runs `work` in its turn and resolves with its result. */
  run<T>(work: () => Promise<T>): Promise<T> {
    return new Promise<T>((resolve, reject) => {
      // Called inside a promise chain, so a `work` that throws before it returns a promise (a route reading a
      // bad parameter as it builds the call) rejects its caller too, instead of escaping from setImmediate and
      // leaving the lane stuck for every later read.
      this.queue.push(() => Promise.resolve().then(work).then(resolve, reject));
      if (!this.running) this.next();
    });
  }

  /** How many reads wait for their turn (for tests and diagnostics). */
  get waiting(): number {
    return this.queue.length;
  }

  private next(): void {
    const job = this.queue.shift();
    if (!job) {
      this.running = false;
      return;
    }
    this.running = true;
    setImmediate(() => {
      void job().finally(() => this.next());
    });
  }
}

/** The process's lane for heavy reads. */
export const heavyReads = new ReadLane();
