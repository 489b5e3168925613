import type { Knex } from 'knex';

/**
 * `plan_runs.plans_version`: raised in the transaction of every statement that writes a
 * proposal's `target_plans` rows (a run storing its plans, a target's plans removed with it).
 * With `inputs_version` (raised by every change of targets, nodes and sites, names included)
 * it versions everything the plans list shows, so the web process can keep a list page it
 * has already built until either changes.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('plan_runs', (t) => {
    t.bigInteger('plans_version').notNullable().defaultTo(0);
  });
  await knex.raw(`
    CREATE FUNCTION target_plans_written() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'DELETE' THEN
        UPDATE plan_runs SET plans_version = plans_version + 1 WHERE proposal_id IN (SELECT DISTINCT proposal_id FROM old_rows);
      ELSE
        UPDATE plan_runs SET plans_version = plans_version + 1 WHERE proposal_id IN (SELECT DISTINCT proposal_id FROM new_rows);
      END IF;
      RETURN NULL;
    END $$;
    CREATE TRIGGER target_plans_written_insert AFTER INSERT ON target_plans REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION target_plans_written();
    CREATE TRIGGER target_plans_written_update AFTER UPDATE ON target_plans REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION target_plans_written();
    CREATE TRIGGER target_plans_written_delete AFTER DELETE ON target_plans REFERENCING OLD TABLE AS old_rows
      FOR EACH STATEMENT EXECUTE FUNCTION target_plans_written();
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw(`
    DROP TRIGGER target_plans_written_delete ON target_plans;
    DROP TRIGGER target_plans_written_update ON target_plans;
    DROP TRIGGER target_plans_written_insert ON target_plans;
    DROP FUNCTION target_plans_written();
  `);
  await knex.schema.alterTable('plan_runs', (t) => {
    t.dropColumn('plans_version');
  });
}
