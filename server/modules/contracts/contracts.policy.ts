import { AppError } from '../../lib/errors/app-error';
import type { Account } from '../accounts/account.entity';
import type { Contract } from './contract.entity';

/** A contract exists only for its two parties; to anyone else it is 404. */
export function assertParty(viewer: Account, contract: Contract | null): asserts contract is Contract {
  if (!contract || (contract.growerId !== viewer.id && contract.grazierId !== viewer.id)) throw AppError.notFound('Contract');
}
