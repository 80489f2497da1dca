/**
 * Work a route starts after it has answered (the password-reset request answers 202 before it looks the email
 * up, so neither the answer nor its timing says whether an account exists). Each piece is kept until it ends,
 * so shutdown lets it finish before the database closes, and tests wait for it before they compare tables.
 * A failure is logged, never thrown at a client that already has its answer.
 */
export class AfterAnswer {
  private readonly pending = new Set<Promise<void>>();

  constructor(private readonly log: (msg: string) => void) {}

  /** Starts `work` now and keeps it until it settles. */
  run(label: string, work: () => Promise<void>): void {
    let started: Promise<void>;
    try {
      started = work();
    } catch (err) {
      // A `work` that throws before it returns its promise is logged like one that rejects: the route has answered.
      started = Promise.reject(err);
    }
    const p: Promise<void> = started
      .catch((err: unknown) => this.log(`[error] ${label}: ${err instanceof Error ? err.message : String(err)}`))
      .finally(() => this.pending.delete(p));
    this.pending.add(p);
  }

  /** Resolves when nothing started by run() is still going (work started meanwhile included). */
  async settled(): Promise<void> {
    while (this.pending.size > 0) await Promise.allSettled([...this.pending]);
  }
}
