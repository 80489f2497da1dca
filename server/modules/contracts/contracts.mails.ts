import type { EntityManager } from 'typeorm';
import { readTogether } from '../../lib/db/reads';
import { composeMail } from '../../lib/mail/compose';
import type { AppLinks } from '../../lib/mail/links';
import type { MailMessage } from '../../lib/mail/mail-port';
import { Account } from '../accounts/account.entity';
import type { Contract } from './contract.entity';
import type { ContractAmendment, SignOff } from './contract-records.entity';
import type { ContractTerms } from '../../../lib/contract-terms';
import { formatDay, formatNumber } from '../../../lib/format';
import type { ContractParty } from '../../../lib/schemas/contract';
import { stayLine } from '../../../lib/terms';

// What contracts mail, composed here and queued by the use case inside its own transaction (the outbox
// sends after the commit). Every message links into the app: the contract, or its log for sign-off.

interface Person {
  email: string;
  name: string;
}

export interface ContractPeople {
  grower: Person | null;
  grazier: Person | null;
}

export async function peopleOf(em: EntityManager, contract: Contract): Promise<ContractPeople> {
  const find = (id: string) => em.findOne(Account, { where: { id }, select: { id: true, email: true, name: true } });
  const [grower, grazier] = await readTogether(em, [() => find(contract.growerId), () => find(contract.grazierId)]);
  return { grower, grazier };
}

function other(party: ContractParty): ContractParty {
  return party === 'grower' ? 'grazier' : 'grower';
}

function headDays(v: number): string {
  return `${formatNumber(v, 4)} head-days`;
}

function hashLine(hash: string): string {
  return `${hash.slice(0, 16)}…`;
}

/** One party signed the terms (or an amendment); `complete` when both have now signed that version. */
export function signedMails(
  links: AppLinks,
  people: ContractPeople,
  c: { id: string; terms: ContractTerms; hash: string },
  signer: ContractParty,
  what: { amendment: ContractAmendment | null; complete: boolean },
): MailMessage[] {
  const block = c.terms.block.name;
  const signerName = people[signer]?.name ?? `The ${signer}`;
  const out: MailMessage[] = [];
  const facts: Array<[string, string]> = [
    ['Terms', `version ${c.terms.version}`],
    ['Terms SHA-256', hashLine(c.hash)],
    ['Stay', stayLine(c.terms)],
  ];
  if (!what.complete) {
    const to = people[other(signer)];
    if (!to) return [];
    return [
      composeMail({
        to: to.email,
        subject: what.amendment ? `${signerName} signed the amendment for ${block}` : `${signerName} signed the contract for ${block}`,
        greeting: `Hello ${to.name},`,
        paragraphs: [
          what.amendment
            ? `${signerName} signed version ${what.amendment.version} of the terms for ${block}. It takes effect when you sign it too; until then the signed version stands.`
            : `${signerName} signed the contract for ${block}. Your signature is the last one needed.`,
        ],
        facts,
        action: { label: what.amendment ? 'Read and sign the amendment' : 'Read and sign the contract', url: links.contract(c.id) },
      }),
    ];
  }
  for (const party of ['grower', 'grazier'] as const) {
    const to = people[party];
    if (!to) continue;
    out.push(
      composeMail({
        to: to.email,
        subject: what.amendment ? `Amendment signed: new terms for ${block}` : `Contract signed by both: ${block}`,
        greeting: `Hello ${to.name},`,
        paragraphs: [
          what.amendment
            ? `Both of you have signed version ${what.amendment.version} of the terms for ${block}. These terms are now the contract.`
            : `Both of you have signed the contract for ${block}. The grazing log opens now; the first move in starts the stay.`,
        ],
        facts,
        caution: `Animals must be out by ${formatDay(c.terms.outBy)}.`,
        action: { label: 'Open the contract', url: links.contract(c.id) },
      }),
    );
  }
  return out;
}

export function amendmentProposedMails(links: AppLinks, people: ContractPeople, contractId: string, terms: ContractTerms, a: ContractAmendment): MailMessage[] {
  const to = people[other(a.proposedBy)];
  if (!to) return [];
  const by = people[a.proposedBy]?.name ?? `The ${a.proposedBy}`;
  return [
    composeMail({
      to: to.email,
      subject: `Amendment proposed: ${terms.block.name}`,
      greeting: `Hello ${to.name},`,
      paragraphs: [
        `${by} proposes to change the terms for ${terms.block.name} (version ${a.version}). Reason: ${a.reason}`,
        'Both of you sign the new version for it to take effect; until then the signed terms stand.',
      ],
      facts: a.changeLines.map((l) => [l.label, `${l.from} → ${l.to}`]),
      action: { label: 'Read and sign the amendment', url: links.contract(contractId) },
    }),
  ];
}

export function amendmentClosedMails(links: AppLinks, people: ContractPeople, contractId: string, terms: ContractTerms, a: ContractAmendment, by: ContractParty): MailMessage[] {
  const to = people[other(by)];
  if (!to) return [];
  const name = people[by]?.name ?? `The ${by}`;
  return [
    composeMail({
      to: to.email,
      subject: a.status === 'withdrawn' ? `Amendment withdrawn: ${terms.block.name}` : `Amendment declined: ${terms.block.name}`,
      greeting: `Hello ${to.name},`,
      paragraphs: [`${name} ${a.status === 'withdrawn' ? 'withdrew' : 'declined'} the proposed version ${a.version} of the terms for ${terms.block.name}. The signed terms stand.`],
      action: { label: 'Open the contract', url: links.contract(contractId) },
    }),
  ];
}

export function cancelledMails(links: AppLinks, people: ContractPeople, contract: Contract, terms: ContractTerms, by: ContractParty, reason: string): MailMessage[] {
  const name = people[by]?.name ?? `The ${by}`;
  const out: MailMessage[] = [];
  for (const party of ['grower', 'grazier'] as const) {
    const to = people[party];
    if (!to) continue;
    out.push(
      composeMail({
        to: to.email,
        subject: `Contract cancelled: ${terms.block.name}`,
        greeting: `Hello ${to.name},`,
        paragraphs: [
          party === by ? `You cancelled the contract for ${terms.block.name}.` : `${name} cancelled the contract for ${terms.block.name} before the animals arrived.`,
          `Reason: ${reason}`,
        ],
        facts: [['Stay', stayLine(terms)]],
        action: { label: 'Open the contract', url: links.contract(contract.id) },
      }),
    );
  }
  return out;
}

export function signOffRequestedMails(links: AppLinks, people: ContractPeople, contractId: string, terms: ContractTerms, s: SignOff): MailMessage[] {
  const to = people.grower;
  if (!to) return [];
  return [
    composeMail({
      to: to.email,
      subject: `Head-days to sign off: ${terms.block.name}`,
      greeting: `Hello ${to.name},`,
      paragraphs: [
        `${s.grazierName} has ended the grazing on ${terms.block.name} and proposes ${headDays(s.proposedHeadDays)}, computed from the grazing log (${s.byDay.length} days).`,
        ...(s.comment ? [`Their note: ${s.comment}`] : []),
        'Approve the figure, or dispute it with a comment and your own figure.',
      ],
      facts: [
        ['Proposed', headDays(s.proposedHeadDays)],
        ['From', formatDay(s.byDay[0]?.date)],
        ['To', formatDay(s.byDay.at(-1)?.date)],
      ],
      action: { label: 'Review the grazing log', url: links.contractLog(contractId) },
    }),
  ];
}

export function signOffAnsweredMails(links: AppLinks, people: ContractPeople, contractId: string, terms: ContractTerms, s: SignOff, what: 'approved' | 'disputed' | 'counter-accepted'): MailMessage[] {
  const block = terms.block.name;
  if (what === 'counter-accepted') {
    const to = people.grower;
    if (!to) return [];
    return [
      composeMail({
        to: to.email,
        subject: `Counter accepted — head-days agreed: ${block}`,
        greeting: `Hello ${to.name},`,
        paragraphs: [`${s.grazierName} accepted your figure of ${headDays(s.counterHeadDays ?? 0)} for ${block}. The head-days are agreed and locked.`],
        facts: [['Agreed', headDays(s.agreedHeadDays ?? 0)]],
        action: { label: 'Open the grazing log', url: links.contractLog(contractId) },
      }),
    ];
  }
  const to = people.grazier;
  if (!to) return [];
  const grower = s.growerName ?? 'The grower';
  return [
    composeMail({
      to: to.email,
      subject: what === 'approved' ? `Head-days agreed: ${block}` : `Head-days disputed: ${block}`,
      greeting: `Hello ${to.name},`,
      paragraphs:
        what === 'approved'
          ? [`${grower} approved ${headDays(s.proposedHeadDays)} for ${block}. The head-days are agreed and locked; you can invoice them.`]
          : [
              `${grower} disputed the ${headDays(s.proposedHeadDays)} you proposed for ${block} and counters with ${headDays(s.counterHeadDays ?? 0)}.`,
              `Their comment: ${s.disputeComment ?? ''}`,
              'Accept the counter, or correct the log and propose again.',
            ],
      facts: what === 'approved' ? [['Agreed', headDays(s.agreedHeadDays ?? s.proposedHeadDays)]] : [['Proposed', headDays(s.proposedHeadDays)], ['Counter', headDays(s.counterHeadDays ?? 0)]],
      action: { label: 'Open the grazing log', url: links.contractLog(contractId) },
    }),
  ];
}
