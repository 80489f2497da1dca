import type { EntityManager } from 'typeorm';
import { composeMail } from '../../lib/mail/compose';
import type { AppLinks } from '../../lib/mail/links';
import type { MailMessage } from '../../lib/mail/mail-port';
import { Account } from '../accounts/account.entity';
import type { Block } from '../blocks/block.entity';
import type { Bid } from './bid.entity';
import { normaliseBid } from '../../../lib/grazing/bid-compare';
import { formatCents } from '../../../lib/money';
import { formatDay } from '../../../lib/format';
import { formatRate } from '../../../lib/terms';
import type { BidView } from '../../../lib/schemas/bid';

// What bids and awards mail, composed here and queued by the use case in its own transaction.

async function personOf(em: EntityManager, accountId: string): Promise<Pick<Account, 'email' | 'name'> | null> {
  return em.findOne(Account, { where: { id: accountId }, select: { id: true, email: true, name: true } });
}

function describe(view: Pick<BidView, 'headCount' | 'species' | 'startDate' | 'endDate' | 'basis' | 'rate' | 'normalised'>): string {
  return (
    `${view.headCount} ${view.species}, ${view.startDate} to ${view.endDate} (${view.normalised.days} days, ${view.normalised.headDays} head-days), ` +
    `${formatRate(view.basis, view.rate)}: estimated total ${formatCents(view.normalised.estimatedTotalCents)}`
  );
}

export async function bidToGrowerMails(em: EntityManager, links: AppLinks, block: Block, view: BidView, what: 'New bid' | 'Bid changed'): Promise<MailMessage[]> {
  const grower = await personOf(em, block.ownerId);
  if (!grower) return [];
  const grazier = view.grazier.businessName ?? view.grazier.name;
  return [
    composeMail({
      to: grower.email,
      subject: `${what} on ${block.name}`,
      greeting: `Hello ${grower.name},`,
      paragraphs: [
        `${grazier} ${what === 'New bid' ? 'bid on' : 'changed their bid on'} ${block.name}: ${describe(view)}.`,
        ...(view.normalised.overgrazes
          ? [`Predicted utilisation ${view.normalised.predictedUtilizationPct.toFixed(0)} % is above your target of ${view.normalised.targetUtilizationPct} %.`]
          : []),
      ],
      action: { label: 'Compare the bids', url: links.block(block.id) },
    }),
  ];
}

export async function awardMails(em: EntityManager, links: AppLinks, block: Block, winner: Bid, declined: Bid[], contractId: string): Promise<MailMessage[]> {
  const out: MailMessage[] = [];
  const grazier = await personOf(em, winner.grazierId);
  if (grazier) {
    const n = normaliseBid(winner, block);
    out.push(
      composeMail({
        to: grazier.email,
        subject: `Your bid on ${block.name} was accepted`,
        greeting: `Hello ${grazier.name},`,
        paragraphs: [`The grower accepted your bid on ${block.name}: ${describe({ ...winner, normalised: n })}.`, 'A contract is ready for both of you to sign.'],
        caution: `Animals must be out by ${formatDay(block.outBy)}.`,
        action: { label: 'Read and sign the contract', url: links.contract(contractId) },
      }),
    );
  }
  for (const bid of declined) {
    const person = await personOf(em, bid.grazierId);
    if (!person) continue;
    out.push(
      composeMail({
        to: person.email,
        subject: `Your bid on ${block.name} was not chosen`,
        greeting: `Hello ${person.name},`,
        paragraphs: [`The grower awarded ${block.name} to another bid. Your bid for ${bid.startDate} to ${bid.endDate} is closed; thank you for bidding.`],
        action: { label: 'Find more grazing', url: links.home() },
      }),
    );
  }
  return out;
}
