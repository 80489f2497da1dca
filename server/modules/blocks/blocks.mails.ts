import { In, type EntityManager } from 'typeorm';
import { composeMail } from '../../lib/mail/compose';
import type { AppLinks } from '../../lib/mail/links';
import type { MailMessage } from '../../lib/mail/mail-port';
import { Account } from '../accounts/account.entity';
import type { Bid } from '../bids/bid.entity';
import type { Block } from './block.entity';
import { stayConflicts } from '../../../lib/grazing/graze-window';

// What a grower's changes to a block mail to the graziers bidding on it; queued by the use case.

async function peopleOf(em: EntityManager, ids: string[]): Promise<Map<string, Pick<Account, 'email' | 'name'>>> {
  if (ids.length === 0) return new Map();
  const rows = await em.find(Account, { where: { id: In(ids) }, select: { id: true, email: true, name: true } });
  return new Map(rows.map((r) => [r.id, r]));
}

export async function blockChangedMails(em: EntityManager, links: AppLinks, block: Block, bids: Bid[], changed: string[]): Promise<MailMessage[]> {
  const people = await peopleOf(em, [...new Set(bids.map((b) => b.grazierId))]);
  return bids.flatMap((bid) => {
    const person = people.get(bid.grazierId);
    if (!person) return [];
    const conflicts = stayConflicts(bid, block);
    return [
      composeMail({
        to: person.email,
        subject: `Block changed: ${block.name}`,
        greeting: `Hello ${person.name},`,
        paragraphs: [
          `The grower changed ${block.name}, which you bid on (${bid.startDate} to ${bid.endDate}). Changed: ${changed.join(', ')}.`,
          ...(conflicts.length > 0 ? [`Your bid no longer fits the block and cannot be awarded until you change it:\n${conflicts.map((c) => `- ${c.message}`).join('\n')}`] : []),
        ],
        action: { label: 'Review your bid', url: links.block(block.id) },
      }),
    ];
  });
}

export async function blockWithdrawnMails(em: EntityManager, links: AppLinks, block: Block, declined: Bid[]): Promise<MailMessage[]> {
  const people = await peopleOf(em, [...new Set(declined.map((b) => b.grazierId))]);
  return declined.flatMap((bid) => {
    const person = people.get(bid.grazierId);
    return person
      ? [
          composeMail({
            to: person.email,
            subject: `Block withdrawn: ${block.name}`,
            greeting: `Hello ${person.name},`,
            paragraphs: [`The grower withdrew ${block.name}. Your bid for ${bid.startDate} to ${bid.endDate} is closed; nothing more is needed from you.`],
            action: { label: 'Find more grazing', url: links.home() },
          }),
        ]
      : [];
  });
}
