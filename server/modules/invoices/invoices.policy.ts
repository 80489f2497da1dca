import { AppError } from '../../lib/errors/app-error';
import type { Account } from '../accounts/account.entity';
import type { Contract } from '../contracts/contract.entity';
import type { Invoice } from './invoice.entity';

// An invoice exists only for the contract's two parties: to anyone else it is 404, so a guessed id tells nothing.
// Of the two, the grazier issues (and may void) and the grower pays; the other party gets 403.

export function assertInvoiceParty(viewer: Account, invoice: Invoice | null): asserts invoice is Invoice {
  if (!invoice || (invoice.grazierId !== viewer.id && invoice.growerId !== viewer.id)) throw AppError.notFound('Invoice');
}

export function assertPayer(viewer: Account, invoice: Invoice): void {
  if (invoice.growerId !== viewer.id) throw AppError.forbidden('Only the grower this invoice is addressed to pays it');
}

export function assertIssuer(viewer: Account, invoice: Invoice): void {
  if (invoice.grazierId !== viewer.id) throw AppError.forbidden('Only the grazier who issued this invoice may do this');
}

/** Only the contract's grazier invoices it; the grower sees 403, anyone else 404. */
export function assertMayInvoice(viewer: Account, contract: Contract | null): asserts contract is Contract {
  if (!contract || (contract.grazierId !== viewer.id && contract.growerId !== viewer.id)) throw AppError.notFound('Contract');
  if (contract.grazierId !== viewer.id) throw AppError.forbidden('Only the grazier on the contract issues its invoice');
}
