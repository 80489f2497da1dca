import type { FormikHelpers } from 'formik';
import { ApiError } from '@/hooks/api/client';
import { Notice } from '@/components/ui';
import { nestErrors } from './nest-errors';

/** Puts the server's per-field messages beside the inputs and returns the message for the form as a whole. */
export function applyServerErrors<V>(
  err: unknown,
  helpers: Pick<FormikHelpers<V>, 'setErrors' | 'setTouched'>,
  mapPath: (path: string) => string = (p) => p,
): string {
  if (err instanceof ApiError) {
    const flat: Record<string, string> = {};
    for (const [path, msg] of Object.entries(err.fields)) flat[mapPath(path)] ??= msg;
    if (Object.keys(flat).length) {
      // Touched too, so each message shows beside its input at once.
      helpers.setTouched(nestErrors(Object.fromEntries(Object.keys(flat).map((k) => [k, true as never]))) as never, false);
      helpers.setErrors(nestErrors(flat) as never);
    }
    return err.message;
  }
  return 'Something went wrong. Please try again.';
}

export function FormError({ message }: { message?: string | null }) {
  if (!message) return null;
  return <Notice tone="danger">{message}</Notice>;
}
