import type { MigrationInterface, QueryRunner } from 'typeorm';
import { DISTANCE_MILES_FN } from '../sql-functions';
import { sqlDialect } from '../sql-dialect';

// The market's distance function on PostgreSQL (server/db/sql-functions.ts). SQLite needs nothing here: there the
// same name is lib/geo's own function, registered on each connection.
//
// The body is lib/geo distanceMiles step by step in float8: the same haversine, the same order of operations and
// the same constants (π/180, the mean Earth radius 6 371 008.8 m and the international mile 1 609.344 m are the
// doubles lib computes: each literal is the shortest decimal of its double). sqrt and the arithmetic are correctly
// rounded on both sides, but sin, cos and asin come from the C library here and from V8's own code in lib, which
// differ in the last bit for about one point in three: the two distances agree to a few units in the last place
// (__tests__/server/schema-engines.test.ts), so only a block within about 1e-15 miles per mile of the limit could be
// in on one engine and out on the other.
export class PostgresFunctions1766200000000 implements MigrationInterface {
  name = 'PostgresFunctions1766200000000';

  async up(q: QueryRunner): Promise<void> {
    if (!sqlDialect(q).postgres) return;
    await q.query(`CREATE OR REPLACE FUNCTION "${DISTANCE_MILES_FN}"(lat1 double precision, lng1 double precision, lat2 double precision, lng2 double precision)
      RETURNS double precision LANGUAGE sql IMMUTABLE STRICT PARALLEL SAFE AS $$
        SELECT 2 * asin(least(1::float8, sqrt(s1 * s1 + cos(p1) * cos(p2) * (s2 * s2)))) * 6371008.8::float8 / 1609.344::float8
        FROM (
          SELECT p1, p2, sin((p2 - p1) / 2) AS s1, sin(((lng2 - lng1) * r) / 2) AS s2
          FROM (SELECT lat1 * r AS p1, lat2 * r AS p2, r FROM (SELECT pi() / 180 AS r) AS k) AS angles
        ) AS parts
      $$`);
  }

  async down(q: QueryRunner): Promise<void> {
    if (!sqlDialect(q).postgres) return;
    await q.query(`DROP FUNCTION IF EXISTS "${DISTANCE_MILES_FN}"(double precision, double precision, double precision, double precision)`);
  }
}
