import type { DataSource, ObjectLiteral, SelectQueryBuilder } from 'typeorm';

// The market's statements change shape with its filters (a condition comes or goes with each one), so they cannot be
// PreparedSelects; but TypeORM renders a builder's SQL afresh on every call, and on the market that rendering cost
// more JavaScript than SQLite spent answering. ShapedSql renders each shape once — the builder's SQL with its
// parameters still named, keyed by what the builder holds (selects, conditions, order; never the values) — and on
// each call only binds the values with the driver's own escapeQueryWithParameters (the same placeholders, array
// expansion and value conversion as the builder). LIMIT and OFFSET are bound too, so every page shares one shape.
//
// For builders on one entity without joins (the lists' own); a shape's text is the builder's, in the driver's
// dialect, kept per data source.

const LIMIT = 'shapeLimit';
const OFFSET = 'shapeOffset';

export interface ShapedRun {
  /** Rows to return (LIMIT, bound as a parameter). */
  limit?: number;
  /** Rows to skip first (OFFSET); needs `limit`. */
  offset?: number;
  /** Wraps the statement once more (kept with the shape): `(inner) => SELECT COUNT(*) … FROM (inner) …`. */
  wrap?: { name: string; sql: (inner: string) => string };
}

export class ShapedSql {
  private readonly shapes = new WeakMap<DataSource, Map<string, string>>();

  /** Past this many shapes the oldest is forgotten (the filters make a few dozen; this bounds a hostile mix). */
  constructor(private readonly maxShapes = 512) {}

  /** The statement with its parameters still named (`:name`), rendered once per shape. */
  named<T extends ObjectLiteral>(ds: DataSource, qb: SelectQueryBuilder<T>, run: ShapedRun = {}): string {
    let known = this.shapes.get(ds);
    if (!known) this.shapes.set(ds, (known = new Map()));
    const e = qb.expressionMap;
    // Checked on every call, not only when a shape is first rendered: a builder the key does not describe must
    // never be answered with another's SQL.
    if (e.limit !== undefined || e.offset !== undefined || e.take !== undefined || e.skip !== undefined) throw new Error('ShapedSql binds LIMIT and OFFSET itself: pass them in the run, not on the builder');
    if (run.offset !== undefined && run.limit === undefined) throw new Error('ShapedSql: an OFFSET needs a LIMIT');
    const main = e.mainAlias;
    if (!main?.hasMetadata || main.subQuery || e.joinAttributes.length > 0 || e.selectDistinctOn.length > 0 || e.lockMode !== undefined || e.commonTableExpressions.length > 0) {
      throw new Error('ShapedSql takes builders on one entity, without joins, subqueries, DISTINCT ON, locks or CTEs');
    }
    const key = JSON.stringify([main.metadata.tableName, main.name, e.selects, e.selectDistinct, e.withDeleted, e.wheres, e.orderBys, e.groupBys, e.havings, e.comment, run.limit !== undefined, run.offset !== undefined, run.wrap?.name]);
    let sql = known.get(key);
    if (sql === undefined) {
      sql = qb.getQuery();
      if (run.limit !== undefined) sql += ` LIMIT :${LIMIT}`;
      if (run.offset !== undefined) sql += ` OFFSET :${OFFSET}`;
      if (run.wrap) sql = run.wrap.sql(sql);
      if (known.size >= this.maxShapes) known.delete(known.keys().next().value!);
      known.set(key, sql);
    }
    return sql;
  }

  /** Runs the builder's statement and answers the rows as the database gives them. */
  async raw<R, T extends ObjectLiteral = ObjectLiteral>(ds: DataSource, qb: SelectQueryBuilder<T>, run: ShapedRun = {}): Promise<R[]> {
    const params: Record<string, unknown> = { ...qb.getParameters() };
    if (run.limit !== undefined) params[LIMIT] = run.limit;
    if (run.offset !== undefined) params[OFFSET] = run.offset;
    const [sql, values] = ds.driver.escapeQueryWithParameters(this.named(ds, qb, run), params);
    return ds.query(sql, values);
  }
}
