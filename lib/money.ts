import { GrazingInputError } from './grazing/errors';

// Money is integer cents everywhere it is stored or sent. A rate may carry fractions of a cent
// ("0.1875" dollars per head-day), so rates are kept as BigInt micro-dollars (10⁻⁶ $) and quantities
// (head-days, acres) as BigInt ten-thousandths; a line is their exact product in 10⁻¹⁰ $, rounded once,
// half-up, to the cent. No floating-point multiplication ever touches an amount.
// Negative quantities, rates and fees are refused (credits would be their own line type, with their own
// rounding rule), so "half-up" here is simply "halves go up".

export const RATE_DECIMALS = 6;
export const QUANTITY_DECIMALS = 4;
const MICROS_PER_DOLLAR = 10n ** BigInt(RATE_DECIMALS);
const QUANTITY_SCALE = 10n ** BigInt(QUANTITY_DECIMALS);
/** quantity units × rate units per cent: 10⁴ × 10⁶ / 100. */
const PRODUCT_UNITS_PER_CENT = (QUANTITY_SCALE * MICROS_PER_DOLLAR) / 100n;

/** A dollar amount of up to 9 whole digits and up to 6 decimals, e.g. "0.18", "0.1875", "12". */
export const RATE_PATTERN = /^\d{1,9}(\.\d{1,6})?$/;

/** Exact micro-dollars of a decimal dollar string: "0.1875" → 187 500n. */
export function parseRate(rate: string): bigint {
  if (typeof rate !== 'string' || !RATE_PATTERN.test(rate)) {
    throw new GrazingInputError('rate', 'Rate must be a dollar amount like 0.18, with at most 6 decimals');
  }
  const [whole, frac = ''] = rate.split('.');
  return BigInt(whole) * MICROS_PER_DOLLAR + BigInt(frac.padEnd(RATE_DECIMALS, '0'));
}

/** Canonical text of a rate in micro-dollars: at least 2 decimals, no trailing zeros beyond them ("0.18", "0.1875", "12.50"). */
export function rateToString(micros: bigint): string {
  if (micros < 0n) throw new GrazingInputError('rate', 'Rate must not be negative');
  const whole = micros / MICROS_PER_DOLLAR;
  let frac = (micros % MICROS_PER_DOLLAR).toString().padStart(RATE_DECIMALS, '0');
  while (frac.length > 2 && frac.endsWith('0')) frac = frac.slice(0, -1);
  return `${whole}.${frac}`;
}

/**
 * Exact ten-thousandths of a non-negative quantity given as a JS number. The number's shortest
 * round-trip text (what JSON carried: 80.25 → "80.25") is read as a decimal, so 0.1 is exactly 1 000
 * ten-thousandths, not 0.1000000000000000055…; more than 4 decimals is refused rather than rounded.
 */
export function quantityToUnits(quantity: number, field = 'quantity'): bigint {
  if (typeof quantity !== 'number' || !Number.isFinite(quantity) || quantity < 0) {
    throw new GrazingInputError(field, 'Quantity must be a number of at least 0');
  }
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(String(quantity));
  if (!m) throw new GrazingInputError(field, 'Quantity must be a plain decimal number');
  const digits = m[1] + (m[2] ?? '');
  // Position of the decimal point counted from the right end of `digits`.
  const fracDigits = (m[2] ?? '').length - Number(m[3] ?? 0);
  const value = BigInt(digits);
  if (fracDigits <= QUANTITY_DECIMALS) return value * 10n ** BigInt(QUANTITY_DECIMALS - fracDigits);
  const divisor = 10n ** BigInt(fracDigits - QUANTITY_DECIMALS);
  if (value % divisor !== 0n) {
    throw new GrazingInputError(field, `Quantity must have at most ${QUANTITY_DECIMALS} decimals`);
  }
  return value / divisor;
}

/** True when `quantity` is a finite number ≥ 0 with at most 4 decimals (for schemas). */
export function isValidQuantity(quantity: unknown): boolean {
  if (typeof quantity !== 'number') return false;
  try {
    quantityToUnits(quantity);
    return true;
  } catch {
    return false;
  }
}

function toSafeCents(cents: bigint, field: string): number {
  if (cents > BigInt(Number.MAX_SAFE_INTEGER)) throw new GrazingInputError(field, 'Amount is too large');
  return Number(cents);
}

/** quantity × rate, rounded half-up to the cent. */
export function lineAmountCents(quantityUnits: bigint, rateMicros: bigint): bigint {
  if (quantityUnits < 0n || rateMicros < 0n) throw new GrazingInputError('quantity', 'Quantity and rate must not be negative');
  const product = quantityUnits * rateMicros;
  return (product * 2n + PRODUCT_UNITS_PER_CENT) / (2n * PRODUCT_UNITS_PER_CENT);
}

export type ChargeBasis = 'head-day' | 'acre' | 'flat';

export const CHARGE_BASES: readonly ChargeBasis[] = Object.freeze(['head-day', 'acre', 'flat'] as ChargeBasis[]);

const BASIS_LABEL: Record<ChargeBasis, string> = {
  'head-day': 'Grazing (head-days)',
  acre: 'Grazing (acres)',
  flat: 'Grazing (flat fee)',
};

export interface FeeInput {
  label: string;
  amountCents: number;
}

export interface ChargeInput {
  basis: ChargeBasis;
  /** Head-days or acres, up to 4 decimals; for a flat charge leave it out (or 1). */
  quantity?: number;
  /** Dollars per unit as a decimal string, e.g. "0.18"; up to 6 decimals. */
  rate: string;
  feesCents?: FeeInput[];
}

export interface ChargeLine {
  kind: 'grazing' | 'fee';
  label: string;
  quantity: number;
  /** Dollars per unit as canonical decimal text ("0.1875"); for a fee, its amount ("25.00"). */
  rate: string;
  amountCents: number;
}

export interface ChargeResult {
  lines: ChargeLine[];
  /** The grazing line(s). */
  subtotalCents: number;
  /** Subtotal plus fees. */
  totalCents: number;
}

export function chargeLines(input: ChargeInput): ChargeResult {
  const basis = input.basis;
  if (!CHARGE_BASES.includes(basis)) throw new GrazingInputError('basis', 'Basis must be head-day, acre or flat');
  let quantity: number;
  if (basis === 'flat') {
    if (input.quantity !== undefined && input.quantity !== 1) {
      throw new GrazingInputError('quantity', 'A flat charge has a quantity of 1');
    }
    quantity = 1;
  } else {
    if (input.quantity === undefined) throw new GrazingInputError('quantity', 'Quantity is required');
    quantity = input.quantity;
  }
  const rateMicros = parseRate(input.rate);
  const grazingCents = lineAmountCents(quantityToUnits(quantity), rateMicros);

  const lines: ChargeLine[] = [
    { kind: 'grazing', label: BASIS_LABEL[basis], quantity, rate: rateToString(rateMicros), amountCents: toSafeCents(grazingCents, 'quantity') },
  ];
  let total = grazingCents;
  (input.feesCents ?? []).forEach((fee, i) => {
    if (!Number.isSafeInteger(fee?.amountCents) || fee.amountCents < 0) {
      throw new GrazingInputError(`feesCents[${i}].amountCents`, 'Fee must be a whole number of cents, at least 0');
    }
    if (typeof fee.label !== 'string' || fee.label.trim() === '') {
      throw new GrazingInputError(`feesCents[${i}].label`, 'Fee needs a label');
    }
    total += BigInt(fee.amountCents);
    lines.push({ kind: 'fee', label: fee.label, quantity: 1, rate: centsToDecimal(BigInt(fee.amountCents)), amountCents: fee.amountCents });
  });
  return { lines, subtotalCents: toSafeCents(grazingCents, 'quantity'), totalCents: toSafeCents(total, 'feesCents') };
}

function centsToDecimal(cents: bigint): string {
  const sign = cents < 0n ? '-' : '';
  const abs = cents < 0n ? -cents : cents;
  return `${sign}${abs / 100n}.${(abs % 100n).toString().padStart(2, '0')}`;
}

/** "$1,234.56" (US grouping, ASCII minus for negatives: "-$5.00"). Written out so it prints the same on every Intl build. */
export function formatCents(cents: number): string {
  if (!Number.isSafeInteger(cents)) throw new GrazingInputError('cents', 'Amount must be a whole number of cents');
  const text = centsToDecimal(BigInt(cents));
  const negative = text.startsWith('-');
  const [whole, frac] = (negative ? text.slice(1) : text).split('.');
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return `${negative ? '-' : ''}$${grouped}.${frac}`;
}
