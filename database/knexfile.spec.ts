// Only knex and the knexfile: this is what a script (setup.ts, a seed, the knex CLI) has, with
// no side-effect import of the server's database module before it.
import knexFactory, { type Knex } from 'knex';
import { knexConfig } from './knexfile';

describe('knexfile', () => {
  let db: Knex;
  beforeAll(() => {
    db = knexFactory(knexConfig());
  });
  afterAll(() => db.destroy());

  it('a Knex built from the knexfile alone returns a DATE as a YYYY-MM-DD string', async () => {
    const { rows } = await db.raw<{ rows: { d: unknown }[] }>("SELECT DATE '2027-03-01' AS d");
    expect(rows[0].d).toBe('2027-03-01');
  });

  it('a Knex built from the knexfile alone returns COUNT(*) and NUMERIC as numbers', async () => {
    const [{ n }] = await db.from(db.raw('generate_series(1, 3)')).count<{ n: unknown }[]>({ n: '*' });
    expect(n).toBe(3);
    const { rows } = await db.raw<{ rows: { x: unknown }[] }>('SELECT 12.50::numeric AS x');
    expect(rows[0].x).toBe(12.5);
  });

  it('knexConfig takes its connection and pool size from the configuration (PG_POOL_MAX)', () => {
    const c = knexConfig('other_db', {
      PGHOST: 'db.example',
      PGPORT: 6543,
      PGUSER: 'u',
      PGPASSWORD: 'p',
      PGDATABASE: 'ignored',
      PG_POOL_MAX: 3,
    });
    expect(c.connection).toMatchObject({ host: 'db.example', port: 6543, user: 'u', password: 'p', database: 'other_db' });
    expect(c.pool).toMatchObject({ max: 3 });
    expect(c.migrations).toMatchObject({ tableName: 'knex_migrations' });
  });
});
