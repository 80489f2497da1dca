import type { FormikHelpers } from 'formik';
import { ApiError } from '@/hooks/api/client';
import { Notice } from '@/components/ui';

/** Puts the server's per-field messages beside the inputs and returns the message for the form as a whole. */
export function applyServerErrors<V>(err: unknown, helpers: Pick<FormikHelpers<V>, 'setErrors' | 'setTouched'>): string {
  if (err instanceof ApiError) {
    if (Object.keys(err.fields).length) {
      helpers.setErrors(err.fields as never);
      helpers.setTouched(Object.fromEntries(Object.keys(err.fields).map((k) => [k.split(/[.[]/)[0], true])) as never, false);
    }
    return err.message;
  }
  return 'Something went wrong. Please try again.';
}

export function FormError({ message }: { message?: string | null }) {
  if (!message) return null;
  return <Notice tone="danger">{message}</Notice>;
}
