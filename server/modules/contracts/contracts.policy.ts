import { AppError } from '../../lib/errors/app-error';
import { hasRole } from '../../lib/http/auth';
import type { Account } from '../accounts/account.entity';
import type { Contract } from './contract.entity';
import type { ContractParty, ContractStatus } from '../../../lib/schemas/contract';

// Who may do what with a contract. Existence never leaks: to anyone but its two parties (and, for reading
// the record, the operator) a contract is 404. A party doing the other party's part is 403, and so is the
// operator doing a party's part: the operator may read the contract, so to them it exists.

/** Acting on a contract is for its two parties: 403 to the operator (who can read it), 404 to anyone else. */
export function assertParty(viewer: Account, contract: Contract | null): asserts contract is Contract {
  if (contract && partyOf(viewer, contract)) return;
  if (contract && hasRole(viewer, 'admin')) throw AppError.forbidden('The operator may read this contract but does not act for either party');
  throw AppError.notFound('Contract');
}

/** The parties read a contract, its log and its PDF; so does the operator (support, disputes). */
export function assertCanRead(viewer: Account, contract: Contract | null): asserts contract is Contract {
  if (contract && hasRole(viewer, 'admin')) return;
  assertParty(viewer, contract);
}

export function partyOf(viewer: Account, contract: Contract): ContractParty | null {
  if (contract.grazierId === viewer.id) return 'grazier';
  if (contract.growerId === viewer.id) return 'grower';
  return null;
}

export function otherParty(party: ContractParty): ContractParty {
  return party === 'grower' ? 'grazier' : 'grower';
}

export function assertIsParty(viewer: Account, contract: Contract, party: ContractParty, message: string): void {
  if (partyOf(viewer, contract) !== party) throw AppError.forbidden(message);
}

/** Statuses in which the terms may still be amended (not once invoiced, paid or cancelled). */
const AMENDABLE: readonly ContractStatus[] = ['to-sign', 'signed', 'grazing', 'sign-off', 'agreed'];
/** Cancelling is for before the animals arrive: the first move-in turns a contract to grazing. */
export const CANCELLABLE: readonly ContractStatus[] = ['to-sign', 'signed'];

export function assertAmendable(contract: Contract): void {
  if (contract.status === 'cancelled') throw AppError.conflict('This contract was cancelled', 'contract_cancelled');
  if (!AMENDABLE.includes(contract.status)) throw AppError.conflict('This contract has been invoiced: its terms can no longer change', 'contract_invoiced');
}

export function canAmend(contract: Contract): boolean {
  return AMENDABLE.includes(contract.status);
}

export function assertCancellable(contract: Contract): void {
  if (contract.status === 'cancelled') throw AppError.conflict('This contract is already cancelled', 'contract_cancelled');
  if (!CANCELLABLE.includes(contract.status)) {
    throw AppError.conflict('The animals have arrived (the log has a move in): a contract can be cancelled only before then', 'not_cancellable');
  }
}
