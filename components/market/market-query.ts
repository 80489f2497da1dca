import { ValidationError } from 'yup';
import type { BlockFilters } from '@/hooks/api/blocks';
import { blockListQuerySchema, type BlockSort, type GrazingSpecies } from '@/lib/schemas/block';

// The Find grazing filters as the grazier types them (text, so "2." survives on the way to "2.5"), and
// the query GET /api/blocks receives. The query is checked with the server's own schema before it is sent,
// so a bad date or "-3" miles shows beside its field instead of turning the whole list into an error.

export type MarketSort = Exclude<BlockSort, 'newest'>;

export interface MarketFilterValues {
  from: string;
  to: string;
  maxMiles: string;
  minAcres: string;
  maxAcres: string;
  minDays: string;
  species: GrazingSpecies | '';
  sort: MarketSort;
}

export type MarketTextFilter = 'from' | 'to' | 'maxMiles' | 'minAcres' | 'maxAcres' | 'minDays';

export const MARKET_PAGE_SIZE = 10;

export const SORT_OPTIONS: ReadonlyArray<{ value: MarketSort; label: string; needs?: 'home' | 'flock' }> = [
  { value: 'distance', label: 'Nearest', needs: 'home' },
  { value: 'window', label: 'Soonest in' },
  { value: 'days', label: 'Most days of feed', needs: 'flock' },
  { value: 'acres', label: 'Most acres' },
];

export function emptyMarketFilters(hasHome: boolean): MarketFilterValues {
  return { from: '', to: '', maxMiles: '', minAcres: '', maxAcres: '', minDays: '', species: '', sort: hasHome ? 'distance' : 'window' };
}

const TEXT_FILTERS: MarketTextFilter[] = ['from', 'to', 'maxMiles', 'minAcres', 'maxAcres', 'minDays'];

/** How many filters narrow the list (sort is not a filter). */
export function activeFilterCount(values: MarketFilterValues): number {
  return TEXT_FILTERS.filter((k) => values[k].trim() !== '').length + (values.species ? 1 : 0);
}

export interface MarketQuery {
  /** The filters to send; only those that passed the schema. */
  filters: BlockFilters;
  /** Per-filter messages from the shared list schema, to show beside the inputs. */
  errors: Partial<Record<keyof MarketFilterValues, string>>;
}

/** The query for the values typed so far: blanks left out, each filter checked by blockListQuerySchema. */
export function marketQuery(values: MarketFilterValues): MarketQuery {
  const query: Record<string, string> = { view: 'market', sort: values.sort };
  for (const k of TEXT_FILTERS) {
    const v = values[k].trim();
    if (v !== '') query[k] = v;
  }
  if (values.species) query.species = values.species;

  const errors: MarketQuery['errors'] = {};
  try {
    blockListQuerySchema.validateSync(query, { abortEarly: false });
  } catch (err) {
    if (!(err instanceof ValidationError)) throw err;
    for (const e of err.inner.length ? err.inner : [err]) {
      const key = e.path as keyof MarketFilterValues | undefined;
      if (key && !(key in errors)) errors[key] = e.message;
    }
  }
  const filters: BlockFilters = {};
  for (const [k, v] of Object.entries(query)) if (!(k in errors)) filters[k as keyof BlockFilters] = v;
  return { filters, errors };
}
