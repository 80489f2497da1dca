import { ShapedSql } from '../../server/lib/db/shaped-sql';
import { Account } from '../../server/modules/accounts/account.entity';
import { makeTestApp } from '../helpers/test-app';

// The market's filtered statements are rendered once per shape and only bound afterwards: the same rows as the
// builder's own getRawMany, whatever the values, the page or the wrapper.
let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp();
  for (const name of ['Ada', 'Ben', 'Cora', 'Dev', 'Eli']) await t.signUp(['grower'], name);
});
afterAll(() => t.close());

const accounts = () => t.dataSource.getRepository(Account).createQueryBuilder('a').select('a.name', 'name');

describe('ShapedSql', () => {
  it('When the same shape comes with other values, pages and wrappers, then the rows are the builder’s own and each shape is rendered once', async () => {
    const shaped = new ShapedSql();
    const renders = jest.fn();
    const plain = () => accounts().where('a.name > :after', { after: 'B' }).orderBy('a.name', 'ASC');
    const built = () => {
      const qb = plain();
      const getQuery = qb.getQuery.bind(qb);
      qb.getQuery = () => (renders(), getQuery());
      return qb;
    };
    const names = (rows: Array<{ name: string }>) => rows.map((r) => r.name);
    expect(names(await shaped.raw(t.dataSource, built()))).toEqual(names(await plain().getRawMany()));
    expect(names(await shaped.raw(t.dataSource, built()))).toEqual(['Ben', 'Cora', 'Dev', 'Eli']);
    expect(names(await shaped.raw(t.dataSource, built().setParameter('after', 'Cz')))).toEqual(['Dev', 'Eli']);
    expect(renders).toHaveBeenCalledTimes(1);
    expect(names(await shaped.raw(t.dataSource, built(), { limit: 2, offset: 1 }))).toEqual(['Cora', 'Dev']);
    expect(names(await shaped.raw(t.dataSource, built(), { limit: 1, offset: 0 }))).toEqual(['Ben']);
    expect(renders).toHaveBeenCalledTimes(2);
    const count = { name: 'count', sql: (inner: string) => `SELECT COUNT(*) AS n FROM (${inner}) capped` };
    const [{ n }] = await shaped.raw<{ n: number | string }>(t.dataSource, built(), { limit: 3, wrap: count });
    expect(Number(n)).toBe(3);
    expect(renders).toHaveBeenCalledTimes(3);
  });

  it('When a condition comes or goes, or an IN list grows, then it is another shape, or the same one with the list expanded at binding', async () => {
    const shaped = new ShapedSql();
    const namedIn = (list: string[]) => accounts().where('a.name IN (:...list)', { list }).orderBy('a.name', 'ASC');
    expect((await shaped.raw<{ name: string }>(t.dataSource, namedIn(['Ada']))).map((r) => r.name)).toEqual(['Ada']);
    expect((await shaped.raw<{ name: string }>(t.dataSource, namedIn(['Eli', 'Ada', 'Zed']))).map((r) => r.name)).toEqual(['Ada', 'Eli']);
    const more = namedIn(['Ada', 'Eli']).andWhere('a.name != :not', { not: 'Ada' });
    expect((await shaped.raw<{ name: string }>(t.dataSource, more)).map((r) => r.name)).toEqual(['Eli']);
    expect(shaped.named(t.dataSource, more)).not.toEqual(shaped.named(t.dataSource, namedIn(['Ada'])));
    expect(shaped.named(t.dataSource, more)).toContain('!=');
  });

  it('When a builder carries its own LIMIT, a join, or an OFFSET without a LIMIT, then it is refused, even after its shape is known', async () => {
    const shaped = new ShapedSql();
    await shaped.raw(t.dataSource, accounts());
    await expect(shaped.raw(t.dataSource, accounts().limit(2))).rejects.toThrow(/binds LIMIT and OFFSET itself/);
    await expect(shaped.raw(t.dataSource, accounts().skip(1).take(2))).rejects.toThrow(/binds LIMIT and OFFSET itself/);
    await expect(shaped.raw(t.dataSource, accounts(), { offset: 1 })).rejects.toThrow(/OFFSET needs a LIMIT/);
    await expect(shaped.raw(t.dataSource, accounts().innerJoin('sessions', 's', 's.account_id = a.id'))).rejects.toThrow(/without joins/);
  });

  it('When more shapes come than it keeps, then the oldest is forgotten and rendered again when it returns', async () => {
    const shaped = new ShapedSql(2);
    const renders = jest.fn();
    const counted = (condition: string) => {
      const qb = accounts().where(condition, { x: 'Ada' });
      const getQuery = qb.getQuery.bind(qb);
      qb.getQuery = () => (renders(), getQuery());
      return qb;
    };
    shaped.named(t.dataSource, counted('a.name = :x'));
    shaped.named(t.dataSource, counted('a.name = :x'));
    expect(renders).toHaveBeenCalledTimes(1);
    shaped.named(t.dataSource, counted('a.name != :x'));
    shaped.named(t.dataSource, counted('a.name > :x'));
    expect(renders).toHaveBeenCalledTimes(3);
    shaped.named(t.dataSource, counted('a.name > :x'));
    expect(renders).toHaveBeenCalledTimes(3);
    shaped.named(t.dataSource, counted('a.name = :x'));
    expect(renders).toHaveBeenCalledTimes(4);
  });
});
