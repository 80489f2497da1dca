import { addDaysToKey } from '../dates';
import { daysBetween } from '../day-keys';
import { formatDay } from '../format';
import { speciesIn, type FlockSpecies, type GrazingSpecies } from './flock-intake';

// The cautions a block carries, computed once here so the server returns them and every screen shows the
// same words. They inform; they never replace the pesticide label (which is the law), local rules, a vet,
// or a licensed pest-control or food-safety adviser — and every text says so.

export interface SprayRecord {
  product: string;
  /** Day the product was (or will be) applied, 'YYYY-MM-DD'. */
  appliedOn: string;
  /** The label's "do not graze within N days" interval; labels run up to 18 months (548 days). */
  grazingRestrictionDays: number;
  containsCopper: boolean;
}

/** First day animals may graze after this application: applied on + the label's restriction days. */
export function sprayRestrictionEnds(record: SprayRecord): string {
  return addDaysToKey(record.appliedOn, record.grazingRestrictionDays);
}

/** The record whose restriction ends last (the one that sets the earliest safe date), or null. */
export function bindingSprayRecord(records: readonly SprayRecord[]): SprayRecord | null {
  let binding: SprayRecord | null = null;
  let end = '';
  for (const r of records) {
    const e = sprayRestrictionEnds(r);
    if (binding === null || e > end) {
      binding = r;
      end = e;
    }
  }
  return binding;
}

/**
 * Earliest day grazing is safe by the spray records: the latest of (applied on + restriction days) over
 * all records — not the latest application plus its own interval, since an earlier spray with a long
 * interval can end later. Null when there are no records.
 */
export function earliestSafeDate(records: readonly SprayRecord[]): string | null {
  const binding = bindingSprayRecord(records);
  return binding ? sprayRestrictionEnds(binding) : null;
}

export type CautionTone = 'danger' | 'caution' | 'info';

export type CautionKey =
  | 'species-not-allowed'
  | 'pesticide-restriction'
  | 'spray-records-none'
  | 'copper-sheep'
  | 'copper'
  | 'food-safety-harvest'
  | 'young-plantings'
  | 'bud-break'
  | 'water-and-heat'
  | 'electric-fence-public';

export interface Caution {
  key: CautionKey;
  tone: CautionTone;
  title: string;
  text: string;
}

export interface CautionBlock {
  crop: string;
  sprayRecords: readonly SprayRecord[];
  outBy: string;
  harvestDate?: string | null;
  youngPlantings: boolean;
  waterOnSite: boolean;
  speciesAllowed: readonly GrazingSpecies[];
}

export interface CautionOptions {
  /** The viewer's (or the bid's) flock; without it, cautions cover every species the block allows. */
  species?: FlockSpecies;
}

const LABEL_SOURCE = 'US EPA Label Review Manual, ch. 11';
/**
 * The cautions that come or go with the species brought (the rest follow from the block alone): a grower comparing
 * a sheep bid with a goat bid on a copper-sprayed vineyard sees the difference on the bid itself.
 */
export const SPECIES_CAUTION_KEYS: readonly CautionKey[] = ['species-not-allowed', 'copper-sheep', 'copper'];

/** Organic rules' gap between raw manure and harvest (7 CFR 205.203): 90 days, or 120 where the crop touches soil. */
export const ORGANIC_MANURE_DAYS = { noSoilContact: 90, soilContact: 120 } as const;
const PRODUCE_CROPS = new Set(['orchard', 'vineyard', 'row-crop cover', 'other']);

/** The cautions that apply to a block, most serious first. */
export function cautionsForBlock(block: CautionBlock, options: CautionOptions = {}): Caution[] {
  const out: Caution[] = [];
  const species: GrazingSpecies[] = options.species ? speciesIn(options.species) : [...block.speciesAllowed];

  const refused = species.filter((s) => !block.speciesAllowed.includes(s));
  if (options.species && refused.length > 0) {
    out.push({
      key: 'species-not-allowed',
      tone: 'danger',
      title: `No ${refused.join(' or ')} on this block`,
      text: `The grower allows only ${block.speciesAllowed.join(' and ')} here. Ask the grower before proposing other stock, and follow local rules.`,
    });
  }

  const binding = bindingSprayRecord(block.sprayRecords);
  if (binding) {
    const safe = sprayRestrictionEnds(binding);
    out.push({
      key: 'pesticide-restriction',
      tone: 'danger',
      title: `No grazing before ${formatDay(safe)}`,
      text:
        `By the spray records the grower entered, the last grazing restriction ends on ${formatDay(safe)} ` +
        `(${binding.product}, applied ${formatDay(binding.appliedOn)}, label: no grazing for ${binding.grazingRestrictionDays} days). ` +
        `The label is the law and some restrict grazing for up to 18 months (${LABEL_SOURCE}): read each label yourself, ` +
        'ask about anything applied since, and follow local rules and your licensed pest-control adviser.',
    });
  } else {
    out.push({
      key: 'spray-records-none',
      tone: 'caution',
      title: 'No spray records entered',
      text:
        'The grower has entered no spray records. Ask what was applied to the block and its borders in the last 18 months ' +
        `and read each label's grazing restriction before animals go in (${LABEL_SOURCE}); follow local rules and licensed advice.`,
    });
  }

  const copper = block.sprayRecords.filter((r) => r.containsCopper);
  if (copper.length > 0) {
    const list = copper.map((r) => `${r.product} (${formatDay(r.appliedOn)})`).join(', ');
    if (species.includes('sheep')) {
      out.push({
        key: 'copper-sheep',
        tone: 'danger',
        title: 'Copper sprays: a risk for sheep',
        text:
          `This block was sprayed with copper: ${list}. Sheep tolerate far less dietary copper than cattle — about 15 ppm ` +
          'in the diet at most, with poisoning reported near 10 ppm (Duncan, In Practice 19(9), 1997). Keep the stay short, watch for illness, and ask your vet before grazing sheep here; ' +
          'the spray labels and local rules come first.',
      });
    } else {
      out.push({
        key: 'copper',
        tone: 'caution',
        title: 'Copper sprays on this block',
        text:
          `This block was sprayed with copper: ${list}. Copper residues on vine and orchard cover can build up in grazing ` +
          'animals; ask your vet how long your stock may stay, and follow the spray labels and local rules.',
      });
    }
  }

  if (PRODUCE_CROPS.has(block.crop)) {
    const gap = block.harvestDate ? daysBetween(block.outBy, block.harvestDate) : null;
    const gapText =
      gap === null
        ? `Animals must be out by ${formatDay(block.outBy)}; the grower gave no harvest date.`
        : `Animals must be out by ${formatDay(block.outBy)}, ${gap} days before harvest on ${formatDay(block.harvestDate)}.`;
    const short = gap !== null && gap < ORGANIC_MANURE_DAYS.soilContact;
    out.push({
      key: 'food-safety-harvest',
      tone: short ? 'danger' : 'caution',
      title: 'Food safety before harvest',
      text:
        `${gapText} The FDA Produce Safety Rule (21 CFR 112, subpart I) sets no fixed wait after grazing but requires ` +
        'the farm to assess animal intrusion and not to harvest contaminated produce. Organic rules use 90 or 120 days ' +
        'between raw manure and harvest (7 CFR 205.203)' +
        (short ? ', longer than this gap' : '') +
        ', and many nut and fruit handlers discourage grazing or require animals out well before harvest. ' +
        "The out-by date is a contract term; check the grower's certifier and handler rules, local rules and licensed food-safety advice.",
    });
  }

  if (block.youngPlantings) {
    out.push({
      key: 'young-plantings',
      tone: 'danger',
      title: 'Young trees or vines: keep animals off them',
      text:
        'The grower marked young plantings on this block. Sheep and goats browse and strip young trees and vines: ' +
        'fence them out or graze only where there are none, as agreed with the grower; follow local rules and licensed advice.',
    });
  }
  // The source names vines (TRADE.md); orchards are covered by the young-plantings flag and the grower's terms.
  if (block.crop === 'vineyard') {
    out.push({
      key: 'bud-break',
      tone: 'caution',
      title: 'Out before bud break',
      text:
        'Untrained sheep browse vines once buds break. ' +
        `Plan to be out before bud break even if the out-by date (${block.outBy}) is later, and agree a plan with the grower; ` +
        'follow local rules and licensed advice.',
    });
  }

  out.push({
    key: 'water-and-heat',
    tone: block.waterOnSite ? 'info' : 'caution',
    title: block.waterOnSite ? 'Water and heat' : 'No water on site: haul water',
    text:
      (block.waterOnSite ? 'The grower says there is water on site. ' : 'The grower says there is no water on site: plan to haul it. ') +
      'Every cell needs water: a ewe drinks about 0.72 gallons a day in winter and up to 2.2 in summer ' +
      '(Chiba, Animal Nutrition Handbook, §16). Give shade on warm days and watch for heat stress; follow local rules and ask your vet if in doubt.',
  });

  out.push({
    key: 'electric-fence-public',
    tone: 'info',
    title: 'Electric fence, people and predators',
    text:
      'Where the public passes — roads, trails, farm workers — post electric-fence warning signs as local rules require. ' +
      'Plan for predators (guardian dogs, night pens) and for safe loading and hauling; follow local rules and licensed advice.',
  });

  const order: Record<CautionTone, number> = { danger: 0, caution: 1, info: 2 };
  return out.map((c, i) => ({ c, i })).sort((a, b) => order[a.c.tone] - order[b.c.tone] || a.i - b.i).map(({ c }) => c);
}
