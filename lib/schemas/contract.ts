import type { NormalisedBid } from '../grazing/bid-compare';
import type { BidTermsView } from './bid';
import type { BlockSummary, PartyView } from './block';

// A contract is born when a grower awards a bid: the agreed terms are copied from the bid and the block at
// that moment, so later edits to either never change what was agreed. Signing, the grazing log, sign-off
// and invoicing come in later issues and add statuses after 'to-sign'.

export const CONTRACT_STATUSES = ['to-sign', 'signed', 'completed', 'cancelled'] as const;
export type ContractStatus = (typeof CONTRACT_STATUSES)[number];

export interface ContractView extends BidTermsView {
  id: string;
  status: ContractStatus;
  blockId: string;
  bidId: string;
  block: BlockSummary;
  grower: PartyView;
  grazier: PartyView;
  outBy: string;
  /** Block figures at award time, the basis of the estimate below. */
  acres: number;
  lbDmPerAcre: number;
  targetUtilizationPct: number;
  timeZone: string;
  /** The agreed terms on a common footing (estimate; the invoice uses the signed-off head-days). */
  normalised: NormalisedBid;
  createdAt: string;
}
