import { AppError } from '../errors/app-error';

/**
 * Counts failed attempts per key in a fixed window, in memory (one process serves Fieldfold).
 * Used on sign-in so a password cannot be guessed at speed; a success clears the key.
 */
export class AttemptLimiter {
  private readonly hits = new Map<string, { count: number; resetAt: number }>();

  constructor(
    private readonly max: number,
    private readonly windowMs: number,
    private readonly now: () => number = Date.now,
  ) {}

  assertAllowed(key: string): void {
    const entry = this.hits.get(key);
    if (!entry || entry.resetAt <= this.now()) return;
    if (entry.count >= this.max) {
      const retryAfter = Math.ceil((entry.resetAt - this.now()) / 1000);
      throw new AppError(429, 'too_many_attempts', `Too many sign-in attempts. Try again in ${Math.ceil(retryAfter / 60)} min.`, undefined, {
        'Retry-After': String(retryAfter),
      });
    }
  }

  fail(key: string): void {
    const now = this.now();
    const entry = this.hits.get(key);
    if (!entry || entry.resetAt <= now) this.hits.set(key, { count: 1, resetAt: now + this.windowMs });
    else entry.count += 1;
    if (this.hits.size > 10_000) this.sweep(now);
  }

  clear(key: string): void {
    this.hits.delete(key);
  }

  private sweep(now: number) {
    for (const [k, v] of this.hits) if (v.resetAt <= now) this.hits.delete(k);
  }
}
