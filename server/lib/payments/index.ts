import type { PaymentsConfig } from '../../config/env';
import type { PaymentsPort } from './payments-port';
import { StripePayments } from './stripe-payments';

export * from './payments-port';

/** The payments adapter for this configuration (the local fake unless a real key is set; see config/env.ts). */
export function createPayments(config: PaymentsConfig): PaymentsPort {
  return new StripePayments(config);
}
