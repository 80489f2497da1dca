import crypto from 'node:crypto';
import type request from 'supertest';
import { addDays, todayIn } from '../../lib/day-keys';
import { startOfLocalDay } from '../../lib/dates';
import { DEFAULT_TIME_ZONE } from '../../lib/schemas/block';
import { bidBody, blockBody } from './market';

// The market and contract steps through the HTTP API only, on any server (an in-process app, or real server
// processes that run on the real clock), with every date taken from the servers' "now": a block open from
// today, a stay starting today, log times between the start of today at the block and now. The race, restart
// and backup tests use it, so they run unchanged against whatever race-targets.ts or server-process.ts gives.

export interface Live {
  /** A request to server `i` (modulo how many there are); the steps use server 0. */
  api: (i?: number) => request.Agent;
  /** The servers' clock, epoch ms. */
  now: () => number;
}

export interface LivePerson {
  token: string;
  email: string;
  user: { id: string; name: string };
  auth: { Authorization: string };
}

function must(res: request.Response, status: number, what: string): request.Response {
  if (res.status !== status) throw new Error(`${what}: expected ${status}, got ${res.status} ${JSON.stringify(res.body)}`);
  return res;
}

export async function signUp(live: Live, roles: Array<'grower' | 'grazier'>, name: string): Promise<LivePerson> {
  const email = `${roles.join('-')}-${crypto.randomUUID()}@test.example`;
  const res = must(await live.api().post('/api/auth/register').send({ email, password: 'long-enough-password', name, roles }), 201, 'sign-up');
  return { token: res.body.token, email, user: res.body.user, auth: { Authorization: `Bearer ${res.body.token}` } };
}

/** A grazier with a home base near the blocks and a flock, as the profile screen saves them. */
export async function grazier(live: Live, name: string): Promise<LivePerson> {
  const p = await signUp(live, ['grazier'], name);
  const profile = { homePlace: 'Pine Hollow corrals', homeLatitude: 39.801, homeLongitude: -121.876, flock: { species: 'sheep', animalClass: 'dry ewes', headCount: 600, bodyWeightLb: 150 } };
  must(await live.api().patch('/api/me').set(p.auth).send(profile), 200, 'profile');
  return p;
}

/** The block's dates from today at the block: open now for 60 days, out by day 50. */
export function blockDates(nowMs: number) {
  const today = todayIn(DEFAULT_TIME_ZONE, nowMs);
  return { windowStart: today, windowEnd: addDays(today, 60), outBy: addDays(today, 50), harvestDate: addDays(today, 200) };
}

/** A ten-day stay starting today at the block (day `offset` later for a second bid that must differ). */
export function stayDates(nowMs: number, offset = 0) {
  const today = todayIn(DEFAULT_TIME_ZONE, nowMs);
  return { startDate: addDays(today, offset), endDate: addDays(today, offset + 10) };
}

/**
 * Instants for log entries in a stay that started today: `n` times spread between the start of today at the
 * block and now, oldest first (so a move in at the first and out at the last are both in the past).
 */
export function logTimes(nowMs: number, n: number): string[] {
  const start = startOfLocalDay(todayIn(DEFAULT_TIME_ZONE, nowMs), DEFAULT_TIME_ZONE);
  const span = nowMs - start;
  return Array.from({ length: n }, (_, i) => new Date(start + Math.floor((span * (i + 1)) / (n + 2))).toISOString());
}

export async function openBlock(live: Live, owner: LivePerson, over: Record<string, unknown> = {}) {
  const created = must(await live.api().post('/api/blocks').set(owner.auth).send(blockBody({ ...blockDates(live.now()), ...over })), 201, 'create block');
  const res = must(await live.api().post(`/api/blocks/${created.body.block.id}/publish`).set(owner.auth), 200, 'publish block');
  return res.body.block as { id: string; name: string };
}

export async function bid(live: Live, who: LivePerson, blockId: string, over: Record<string, unknown> = {}) {
  const res = must(await live.api().post(`/api/blocks/${blockId}/bids`).set(who.auth).send(bidBody({ ...stayDates(live.now()), ...over })), 201, 'bid');
  return res.body.bid as { id: string };
}

export async function award(live: Live, grower: LivePerson, bidId: string): Promise<string> {
  return must(await live.api().post(`/api/bids/${bidId}/award`).set(grower.auth), 201, 'award').body.contract.id;
}

/** What a party sends to sign: the typed name, the ticked cautions and the hash of the text shown to them. */
export async function signBody(live: Live, who: LivePerson, contractId: string) {
  const c = must(await live.api().get(`/api/contracts/${contractId}`).set(who.auth), 200, 'read contract').body.contract;
  return { typedName: who.user.name, cautionsAcknowledged: true, termsHash: c.pendingAmendment?.termsHash ?? c.termsHash };
}

export function logEntry(kind: 'move' | 'tally' | 'observation', at: string, over: Record<string, unknown> = {}) {
  return { clientId: crypto.randomUUID(), kind, at, ...over };
}

/** A grower, a grazier and an awarded contract between them, to sign. */
export async function awarded(live: Live) {
  const grower = await signUp(live, ['grower'], 'Greta Olsen');
  const graz = await grazier(live, 'Wade Kellner');
  const block = await openBlock(live, grower);
  const b = await bid(live, graz, block.id);
  return { grower, grazier: graz, blockId: block.id, bidId: b.id, contractId: await award(live, grower, b.id) };
}

export async function signed(live: Live) {
  const a = await awarded(live);
  for (const who of [a.grower, a.grazier]) must(await live.api().post(`/api/contracts/${a.contractId}/sign`).set(who.auth).send(await signBody(live, who, a.contractId)), 200, 'sign');
  return a;
}

/** Signed, with 600 head logged in and out today: ready for the grazier to propose the head-days. */
export async function grazed(live: Live) {
  const a = await signed(live);
  const [inAt, outAt] = logTimes(live.now(), 2);
  must(await live.api().post(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth).send(logEntry('move', inAt, { change: 600, paddock: 'North cell' })), 201, 'move in');
  must(await live.api().post(`/api/contracts/${a.contractId}/log`).set(a.grazier.auth).send(logEntry('move', outAt, { change: -600 })), 201, 'move out');
  return a;
}

/** Grazed, proposed and approved: the head-days are agreed, ready to invoice. */
export async function agreed(live: Live) {
  const a = await grazed(live);
  must(await live.api().post(`/api/contracts/${a.contractId}/sign-off`).set(a.grazier.auth).send({ action: 'propose' }), 200, 'propose');
  must(await live.api().post(`/api/contracts/${a.contractId}/sign-off`).set(a.grower.auth).send({ action: 'approve' }), 200, 'approve');
  return a;
}

/** Agreed and invoiced (sent through the payments API, which must be up). */
export async function invoiced(live: Live) {
  const a = await agreed(live);
  const res = must(await live.api().post(`/api/contracts/${a.contractId}/invoice`).set(a.grazier.auth).send({}), 201, 'invoice');
  if (res.body.invoice.status !== 'sent') throw new Error(`invoice not sent: ${JSON.stringify(res.body.invoice)}`);
  return { ...a, invoiceId: res.body.invoice.id as string };
}
