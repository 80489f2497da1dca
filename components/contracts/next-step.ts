import { formatNumber } from '@/lib/format';
import type { SignatureView } from '@/lib/schemas/contract';
import { pendingAmendmentOf, signOffOf, type ContractDetailView } from '@/hooks/api/contracts';

// What each party must do next on a contract, in one place: the list shows it on every card, the contract
// screen leads with it.

export type Side = 'grower' | 'grazier';

export function sideOf(c: Pick<ContractDetailView, 'grower' | 'grazier'>, viewerId: string | undefined): Side | null {
  if (c.grazier.id === viewerId) return 'grazier';
  if (c.grower.id === viewerId) return 'grower';
  return null;
}

/** The party's signature on the terms as they stand now (an amendment changes the terms hash). */
export function currentSignature(c: Pick<ContractDetailView, 'signatures' | 'termsHash'>, side: Side): SignatureView | null {
  return c.signatures?.find((s) => s.party === side && (!c.termsHash || s.termsHash === c.termsHash)) ?? null;
}

export interface NextStep {
  /** True when the viewer is the one who must act. */
  mine: boolean;
  text: string;
}

// Sign-off figures at the precision they are agreed and billed: 0.0001 head-day.
const headDays = (n: number | null | undefined) => `${formatNumber(n ?? 0, 4)} head-days`;

export function nextStep(c: ContractDetailView, side: Side | null): NextStep {
  const other: Side = side === 'grower' ? 'grazier' : 'grower';
  const signOff = signOffOf(c);
  const amendment = pendingAmendmentOf(c);
  if (c.viewer?.mustSign) return { mine: true, text: amendment ? 'Read the proposed change, then sign the new terms' : 'Read the terms and cautions, then sign' };
  switch (c.status) {
    case 'to-sign': {
      if (!side) return { mine: false, text: 'Waiting for both signatures' };
      const change = amendment ? 'Read the proposed change, then sign the new terms' : 'Read the terms and cautions, then sign';
      if (!c.viewer && !currentSignature(c, side)) return { mine: true, text: change };
      return { mine: false, text: `Waiting for the ${other} to sign` };
    }
    case 'signed':
      return side === 'grazier' ? { mine: true, text: 'Log “Animals in” when the flock arrives' } : { mine: false, text: 'Signed: waiting for the animals to arrive' };
    case 'grazing':
      return side === 'grazier'
        ? { mine: true, text: 'Keep the log; when the animals are out, propose the head-days' }
        : { mine: false, text: 'Grazing under way: the log is open to you' };
    case 'sign-off': {
      if (signOff?.status === 'disputed') {
        return side === 'grazier'
          ? { mine: true, text: `The grower counters with ${headDays(signOff.counterHeadDays)}: accept it, or amend the log and propose again` }
          : { mine: false, text: 'Waiting for the grazier to answer your counter' };
      }
      return side === 'grower'
        ? { mine: true, text: `Approve or dispute the ${headDays(signOff?.proposedHeadDays)} the grazier proposed` }
        : { mine: false, text: 'Waiting for the grower to approve the head-days' };
    }
    case 'agreed':
      return side === 'grazier' ? { mine: true, text: `Head-days agreed (${headDays(c.agreedHeadDays ?? signOff?.agreedHeadDays)}): send the invoice` } : { mine: false, text: 'Head-days agreed: the invoice comes next' };
    case 'invoiced':
      return side === 'grower' ? { mine: true, text: 'Pay the invoice' } : { mine: false, text: 'Invoiced: waiting for payment' };
    case 'paid':
      return { mine: false, text: 'Paid: nothing more to do' };
    case 'cancelled':
      return { mine: false, text: 'Cancelled' };
  }
}
