import type { ChargeBasis, ChargeResult } from '../../../lib/money';
import { BASIS_QUANTITY_UNIT } from '../../../lib/terms';
import type { InvoicePdfLine } from './types';

/** Invoice lines from lib/money chargeLines(): the grazing line counted in the basis's unit, fees as one each. */
export function invoiceLinesFromCharge(charge: ChargeResult, basis: ChargeBasis): InvoicePdfLine[] {
  return charge.lines.map((l) => ({
    kind: l.kind,
    description: l.label,
    quantity: l.quantity,
    unit: l.kind === 'grazing' ? BASIS_QUANTITY_UNIT[basis] : 'fee',
    rate: l.rate,
    amountCents: l.amountCents,
  }));
}
