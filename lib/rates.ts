import type { ChargeBasis } from './money';

// Fieldfold's words for a price and what it is charged on, shared by the screens, the invoice and the PDFs.

/** "$0.18", "$0.1875", "$1,250.00": a rate in dollars as its decimal text (up to 6 decimals), grouped, at least 2 decimals. */
export function formatRateAmount(rate: string): string {
  const [whole, frac = ''] = rate.split('.');
  return `$${whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',')}.${frac.padEnd(2, '0')}`;
}

/** "$0.18 per head-day", "$22.50 per acre", "$4,200.00 for the job" — the rate as the grazier wrote it, grouped. */
export function formatRate(basis: ChargeBasis, rate: string): string {
  const money = formatRateAmount(rate);
  return basis === 'head-day' ? `${money} per head-day` : basis === 'acre' ? `${money} per acre` : `${money} for the job`;
}

/** The unit an invoice line's quantity is counted in, for each pricing basis. */
export const BASIS_QUANTITY_UNIT: Record<ChargeBasis, string> = { 'head-day': 'head-days', acre: 'acres', flat: 'job' };
