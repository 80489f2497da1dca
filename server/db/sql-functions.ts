import { distanceMiles } from '../../lib/geo';

// The one engine-specific piece of the market's SQL. On SQLite (better-sqlite3) the great-circle distance is
// lib/geo's own function registered on each connection (prepareDatabase), so SQL and the block view compute
// the very same float and a block at exactly `maxMiles` is in or out the same way in both. On PostgreSQL the
// same name is a SQL function with lib/geo's haversine step by step, created by a migration
// (migrations/1766200000000-postgres-functions.ts), equal to lib's to a few units in the last place (the C
// library's sin is not V8's); callers only ever use distanceMilesSql().

export const DISTANCE_MILES_FN = 'ff_distance_miles';

interface FunctionHost {
  function(name: string, options: { deterministic: boolean }, fn: (...args: number[]) => number): unknown;
}

/** Registers Fieldfold's SQL functions on a better-sqlite3 connection. */
export function registerSqlFunctions(db: FunctionHost): void {
  db.function(DISTANCE_MILES_FN, { deterministic: true }, (lat1, lng1, lat2, lng2) =>
    distanceMiles({ latitude: lat1, longitude: lng1 }, { latitude: lat2, longitude: lng2 }),
  );
}

/** SQL for the miles from the point in the named parameters to the block aliased `alias` (arguments in lib's order: from, to). */
export function distanceMilesSql(latParam: string, lngParam: string, alias = 'b'): string {
  return `${DISTANCE_MILES_FN}(:${latParam}, :${lngParam}, ${alias}.latitude, ${alias}.longitude)`;
}
