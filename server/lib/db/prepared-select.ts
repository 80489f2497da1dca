import type { DataSource, EntityManager, EntityMetadata, ObjectLiteral, SelectQueryBuilder } from 'typeorm';
import type { ColumnMetadata } from 'typeorm/metadata/ColumnMetadata';
import { DriverUtils } from 'typeorm/driver/DriverUtils';

// TypeORM builds the SQL of a query builder afresh on every call: on the hot reads that building cost several
// times what SQLite spends answering (≈0.3 ms of JavaScript for a primary-key lookup that SQLite answers in
// 0.02 ms). A PreparedSelect builds its SQL once, with the parameters still named, and on each run only binds
// the values (the driver's own escapeQueryWithParameters: the same placeholders, array expansion and value
// conversion as the builder) and hydrates the rows with the driver's own column conversion. The statement text
// is the builder's, so it runs the same on PostgreSQL. Only for queries whose shape never depends on the
// values: a condition that comes and goes is a second PreparedSelect.

export class PreparedSelect<T extends ObjectLiteral> {
  private built: { sql: string; meta: EntityMetadata; columns: Array<{ key: string; column: ColumnMetadata }> } | null = null;

  constructor(
    private readonly ds: DataSource,
    private readonly build: (em: EntityManager) => SelectQueryBuilder<T>,
    /** `limit: true` ends the statement with LIMIT :limit (the builder's own limit would be fixed in the text). */
    private readonly options: { limit?: boolean } = {},
  ) {}

  private prepared() {
    if (this.built === null) {
      const qb = this.build(this.ds.manager);
      const meta = qb.expressionMap.mainAlias!.metadata;
      // The builder's own aliases for the main entity's columns ("e_contract_id").
      const columns = meta.columns.map((column) => ({ key: DriverUtils.buildAlias(this.ds.driver, undefined, qb.alias, column.databaseName), column }));
      this.built = { sql: this.options.limit ? `${qb.getQuery()} LIMIT :limit` : qb.getQuery(), meta, columns };
    }
    return this.built;
  }

  /** The rows as the database gives them (for queries that select raw columns). */
  async raw<R = Record<string, unknown>>(params: Record<string, unknown>, em: EntityManager = this.ds.manager): Promise<R[]> {
    const [sql, values] = this.ds.driver.escapeQueryWithParameters(this.prepared().sql, params);
    return em.query(sql, values);
  }

  /** The rows as entities of the builder's main alias (which must select that entity's columns). */
  async many(params: Record<string, unknown>, em: EntityManager = this.ds.manager): Promise<T[]> {
    const rows = await this.raw(params, em);
    const { meta, columns } = this.prepared();
    // Each column through the driver's conversion (dates, JSON, booleans) and the column's transformer.
    return rows.map((row) => {
      const entity = meta.create() as Record<string, unknown>;
      for (const { key, column } of columns) if (key in row) entity[column.propertyName] = this.ds.driver.prepareHydratedValue(row[key], column);
      return entity as T;
    });
  }

  async one(params: Record<string, unknown>, em: EntityManager = this.ds.manager): Promise<T | null> {
    return (await this.many(params, em))[0] ?? null;
  }
}
