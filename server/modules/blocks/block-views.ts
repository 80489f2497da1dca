import type { EntityManager } from 'typeorm';
import { PreparedSelect } from '../../lib/db/prepared-select';
import { Account } from '../accounts/account.entity';
import { readTogether } from '../../lib/db/reads';
import { hasRole } from '../../lib/http/auth';
import type { ServiceContext } from '../../lib/service-context';
import { Bid } from '../bids/bid.entity';
import { Block } from './block.entity';
import { BlockPhoto } from './block-photo.entity';
import { canBidOn, isOwner } from './blocks.policy';
import { photoUrl, signPhotoAccess } from './photo-access';
import { capacity, daysForHead } from '../../../lib/grazing/capacity';
import { intakeForFlock, type FlockSpecies } from '../../../lib/grazing/flock-intake';
import { grazeSpan, type GrazeSpan } from '../../../lib/grazing/graze-window';
import { cautionsForBlock } from '../../../lib/grazing/safety';
import { distanceMiles } from '../../../lib/geo';
import type { BlockCardView, BlockInput, BlockSummary, BlockView, CautionFlagView, FlockFit, PartyView } from '../../../lib/schemas/block';

// Turns stored blocks into what the API returns, with the figures that depend on who is looking: distance
// from their home base, days of feed for their flock, the cautions for their species. Every figure comes
// from lib/ (the same functions the calculator and the app use).

export function partyOf(a: Account): PartyView {
  return { id: a.id, name: a.name, businessName: a.businessName };
}

export function blockSummary(b: Block): BlockSummary {
  return { id: b.id, name: b.name, status: b.status, crop: b.crop, acres: b.acres, placeName: b.placeName, timeZone: b.timeZone };
}

/** The viewer's flock, when they are a grazier who has described one in their profile. */
export function flockOf(viewer: Account): { species: FlockSpecies; animalClass: string; headCount: number; bodyWeightLb: number } | null {
  if (!hasRole(viewer, 'grazier')) return null;
  if (!viewer.flockSpecies || !viewer.flockClass || viewer.flockHeadCount == null || viewer.flockBodyWeightLb == null) return null;
  return { species: viewer.flockSpecies as FlockSpecies, animalClass: viewer.flockClass, headCount: viewer.flockHeadCount, bodyWeightLb: viewer.flockBodyWeightLb };
}

export function homeOf(viewer: Account): { latitude: number; longitude: number } | null {
  if (viewer.homeLatitude == null || viewer.homeLongitude == null) return null;
  return { latitude: viewer.homeLatitude, longitude: viewer.homeLongitude };
}

export interface ViewerFigures {
  span: GrazeSpan;
  distanceMiles: number | null;
  capacity: number | null;
  daysForMyFlock: number | null;
  flockFit: FlockFit | null;
}

/** The figures list filters and sorts on, cheap enough to compute for every open block. */
export function viewerFigures(viewer: Account, block: Block): ViewerFigures {
  const home = homeOf(viewer);
  const flock = flockOf(viewer);
  let fit: FlockFit | null = null;
  let headDays: number | null = null;
  let days: number | null = null;
  if (flock) {
    const intake = intakeForFlock(flock.species, flock.animalClass);
    fit = { headCount: flock.headCount, bodyWeightLb: flock.bodyWeightLb, intakePctBodyWeight: intake.pct, intakeBasis: intake.basis, intakeSource: intake.source };
    headDays = capacity({
      acres: block.acres,
      lbDmPerAcre: block.lbDmPerAcre,
      utilizationPct: block.targetUtilizationPct,
      animal: { bodyWeightLb: flock.bodyWeightLb, intakePctBodyWeight: intake.pct },
    }).headDays;
    days = daysForHead(headDays, flock.headCount);
  }
  return {
    span: grazeSpan(block),
    distanceMiles: home ? distanceMiles(home, block) : null,
    capacity: headDays,
    daysForMyFlock: days,
    flockFit: fit,
  };
}

/** Cautions as a list shows them: key, tone and title; the full text is on the block's page. */
export function cautionFlags(cautions: ReadonlyArray<CautionFlagView>): CautionFlagView[] {
  return cautions.map(({ key, tone, title }) => ({ key, tone, title }));
}

/** A block's view as a list shows it: the same figures, the cautions as flags, the page-only fields left out. */
export function blockCard(view: BlockView): BlockCardView {
  const { cautions, sprayRecords: _sprays, notes: _notes, forageSamples: _samples, forageHeight: _heights, ...card } = view;
  return { ...card, cautions: cautionFlags(cautions) };
}

/** The block as the grower entered it: the base a PATCH is merged into. */
export function blockInputOf(b: Block): BlockInput {
  return {
    ...enteredFields(b),
    forageMethod: b.forageMethod,
    ...(b.forageMethod === 'direct' ? { lbDmPerAcre: b.lbDmPerAcre } : {}),
    ...(b.forageMethod === 'samples' && b.forageSamples ? { forageSamples: b.forageSamples } : {}),
    ...(b.forageMethod === 'height' && b.forageHeight ? { forageHeight: b.forageHeight } : {}),
  };
}

/** What the grower entered apart from the forage measurement: the same in the stored input and in every view. */
function enteredFields(b: Block) {
  return {
    name: b.name,
    crop: b.crop,
    acres: b.acres,
    placeName: b.placeName,
    latitude: b.latitude,
    longitude: b.longitude,
    timeZone: b.timeZone,
    targetUtilizationPct: b.targetUtilizationPct,
    residualHeightIn: b.residualHeightIn,
    windowStart: b.windowStart,
    windowEnd: b.windowEnd,
    outBy: b.outBy,
    harvestDate: b.harvestDate,
    sprayRecords: b.sprayRecords,
    waterOnSite: b.waterOnSite,
    perimeterFence: b.perimeterFence,
    truckAccess: b.truckAccess,
    speciesAllowed: b.speciesAllowed,
    youngPlantings: b.youngPlantings,
    notes: b.notes,
  };
}

// Only what the views show: the owners' names, the photos, the viewer's own live bids, and live-bid counts for
// the owner; each statement built once (PreparedSelect). status = 'live' is written out so SQLite can use the
// partial unique index on live bids.
const viewOwners = new PreparedSelect((em) => em.createQueryBuilder(Account, 'a').select(['a.id', 'a.name', 'a.businessName']).where('a.id IN (:...ids)'));
const viewPhotos = new PreparedSelect((em) => em.createQueryBuilder(BlockPhoto, 'p').where('p.block_id IN (:...ids)').orderBy('p.position', 'ASC'));
const viewMyLiveBids = new PreparedSelect((em) =>
  em.createQueryBuilder(Bid, 'bid').select('bid.id', 'id').addSelect('bid.block_id', 'blockId').where("bid.status = 'live'").andWhere('bid.grazier_id = :viewer AND bid.block_id IN (:...ids)'),
);
const viewLiveCounts = new PreparedSelect((em) =>
  em
    .createQueryBuilder(Bid, 'bid')
    .select('bid.block_id', 'blockId')
    .addSelect('COUNT(*)', 'n')
    .where("bid.status = 'live'")
    .andWhere('bid.block_id IN (:...ownIds)')
    .groupBy('bid.block_id'),
);

/** Builds views for several blocks with one query per related table. */
export async function blockViews(ctx: ServiceContext, viewer: Account, blocks: Block[], em: EntityManager = ctx.ds.manager): Promise<BlockView[]> {
  if (blocks.length === 0) return [];
  const ids = blocks.map((b) => b.id);
  const ownerIds = [...new Set(blocks.map((b) => b.ownerId))];
  const ownIds = blocks.filter((b) => isOwner(viewer, b)).map((b) => b.id);
  // Only what the views show: the owners' names, the viewer's own live bids, and live-bid counts for the owner.
  const [owners, photos, myLiveBids, liveCounts] = await readTogether(em, [
    () => viewOwners.many(em, { ids: ownerIds }),
    () => viewPhotos.many(em, { ids }),
    () => viewMyLiveBids.raw<{ id: string; blockId: string }>(em, { viewer: viewer.id, ids }),
    () => (ownIds.length === 0 ? Promise.resolve([]) : viewLiveCounts.raw<{ blockId: string; n: number }>(em, { ownIds })),
  ]);
  const ownerById = new Map(owners.map((o) => [o.id, o]));
  const myLiveBidByBlock = new Map(myLiveBids.map((x) => [x.blockId, x.id]));
  const liveCountByBlock = new Map(liveCounts.map((x) => [x.blockId, Number(x.n)]));
  const photosByBlock = new Map<string, BlockPhoto[]>();
  for (const p of photos) photosByBlock.set(p.blockId, [...(photosByBlock.get(p.blockId) ?? []), p]);
  const flock = flockOf(viewer);

  return blocks.map((b) => {
    const owner = ownerById.get(b.ownerId);
    const mine = isOwner(viewer, b);
    const figures = viewerFigures(viewer, b);
    const myLiveBidId = myLiveBidByBlock.get(b.id) ?? null;
    return {
      id: b.id,
      status: b.status,
      owner: owner ? partyOf(owner) : { id: b.ownerId, name: 'Unknown grower', businessName: null },
      ...enteredFields(b),
      forageMethod: b.forageMethod,
      lbDmPerAcre: b.lbDmPerAcre,
      forageSamples: b.forageSamples,
      forageHeight: b.forageHeight,
      earliestSafeDate: figures.span.earliestSafeDate,
      grazeFrom: figures.span.from,
      grazeUntil: figures.span.until,
      distanceMiles: figures.distanceMiles,
      capacity: figures.capacity,
      daysForMyFlock: figures.daysForMyFlock,
      flockFit: figures.flockFit,
      cautions: cautionsForBlock(b, flock && !mine ? { species: flock.species } : {}),
      photos: (photosByBlock.get(b.id) ?? []).map((p) => ({
          id: p.id,
          url: photoUrl(b.id, p.id, signPhotoAccess(ctx.tokenSecret, { photoId: p.id, blockId: b.id, viewer })),
          mimeType: p.mimeType,
          sizeBytes: p.sizeBytes,
          createdAt: p.createdAt.toISOString(),
        })),
      liveBidCount: mine ? (liveCountByBlock.get(b.id) ?? 0) : null,
      viewer: { isOwner: mine, canBid: canBidOn(viewer, b) && !myLiveBidId, myLiveBidId },
      publishedAt: b.publishedAt?.toISOString() ?? null,
      awardedAt: b.awardedAt?.toISOString() ?? null,
      createdAt: b.createdAt.toISOString(),
      updatedAt: b.updatedAt.toISOString(),
    };
  });
}
