import { useEffect, useState } from 'react';

// Token rotation: past half its life (issued → expires, TOKEN_TTL on the server) the app trades its token for a
// new one (POST /api/auth/refresh), which closes the old session. A session in use stays signed in; a copy of
// an old token (and every photo or PDF link made under it) dies with the session it belonged to.

/** When it fails (no signal on the truck, the server restarting), the next try comes this much later. */
export const ROTATION_RETRY_MS = 5 * 60_000;
/** setTimeout's largest delay (about 24.8 days); a longer wait is taken in steps. */
const MAX_TIMEOUT_MS = 2 ** 31 - 1;

/** The instant (epoch ms) half-way through a token's life, from its own `iat` and `exp`; null when it has none. */
export function rotationDueAt(token: string): number | null {
  try {
    const part = token.split('.')[1];
    if (!part) return null;
    const base64 = part.replace(/-/g, '+').replace(/_/g, '/');
    const claims = JSON.parse(atob(base64.padEnd(base64.length + ((4 - (base64.length % 4)) % 4), '='))) as { iat?: unknown; exp?: unknown };
    if (typeof claims.iat !== 'number' || typeof claims.exp !== 'number' || claims.exp <= claims.iat) return null;
    return ((claims.iat + claims.exp) / 2) * 1000;
  } catch {
    return null;
  }
}

/**
 * Calls `rotate(token)` once the token is past half its life (at once when it already is), and again every
 * ROTATION_RETRY_MS while `rotate` reports failure. A new token from `rotate` starts the clock over.
 */
export function useTokenRotation(token: string | null, rotate: (token: string) => Promise<boolean>, now: () => number = Date.now): void {
  const [failures, setFailures] = useState(0);
  // Bumped to arm the timer again after a wait longer than setTimeout allows.
  const [wakes, setWakes] = useState(0);
  useEffect(() => setFailures(0), [token]);
  useEffect(() => {
    if (!token) return;
    const due = rotationDueAt(token);
    if (due === null) return;
    let cancelled = false;
    const wait = failures > 0 ? ROTATION_RETRY_MS : Math.max(0, due - now());
    const timer = setTimeout(
      async () => {
        // A wait longer than setTimeout allows ends early: wait again.
        if (now() < due) return void (cancelled || setWakes((n) => n + 1));
        const ok = await rotate(token);
        if (!ok && !cancelled) setFailures((n) => n + 1);
      },
      Math.min(wait, MAX_TIMEOUT_MS),
    );
    return () => {
      cancelled = true;
      clearTimeout(timer);
    };
  }, [token, failures, wakes, rotate, now]);
}
