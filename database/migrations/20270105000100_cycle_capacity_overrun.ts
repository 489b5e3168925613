import type { Knex } from 'knex';

/**
 * `cycles.capacity_overrun`: what submission does with a proposal that asks a node for more
 * node-hours than the cycle offers there: 'warn' (the default, and what every existing cycle
 * keeps) or 'block'.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cycles', (t) => {
    t.text('capacity_overrun').notNullable().defaultTo('warn');
    t.check("capacity_overrun IN ('warn', 'block')", [], 'cycles_capacity_overrun_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('cycles', (t) => {
    t.dropChecks(['cycles_capacity_overrun_check']);
    t.dropColumn('capacity_overrun');
  });
}
