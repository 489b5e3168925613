import type { Knex } from 'knex';

/**
 * The plans list without the explained numbers, and "out of date" without reloading targets.
 *
 * `target_plans.summary` (jsonb): the row the plans table shows (everything of `result` but
 * `quantities`), written by the plan job beside the full result, so that a page of the list
 * reads a few hundred bytes per plan instead of converting each ~10 kB result.
 *
 * `plan_runs.inputs_version`: raised in the same transaction as any change of what the plans
 * depend on (targets, requested nodes, completeness, the cycle's campaign, a node's or site's
 * values), by triggers, so that no code path can forget it. `current_hash` caches the inputs
 * hash of that version (with `current_hash_model`, the model version it was computed with);
 * it is cleared by the same triggers and filled again by the next reader or run.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('target_plans', (t) => {
    t.jsonb('summary');
  });
  await knex.raw(`UPDATE target_plans SET summary = result::jsonb - 'quantities' WHERE result IS NOT NULL`);
  await knex.raw(`ALTER TABLE target_plans ADD CONSTRAINT target_plans_summary_check CHECK ((summary IS NULL) = (result IS NULL))`);

  await knex.schema.alterTable('plan_runs', (t) => {
    t.integer('inputs_version').notNullable().defaultTo(0);
    t.text('current_hash');
    t.text('current_hash_model');
  });

  await knex.raw(`
    CREATE FUNCTION plan_inputs_changed(ids int[]) RETURNS void LANGUAGE sql AS $$
      UPDATE plan_runs SET inputs_version = inputs_version + 1, current_hash = NULL WHERE proposal_id = ANY(ids)
    $$;

    CREATE FUNCTION plan_inputs_changed_by_targets() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'DELETE' THEN
        PERFORM plan_inputs_changed(ARRAY(SELECT DISTINCT proposal_id FROM old_rows));
      ELSE
        PERFORM plan_inputs_changed(ARRAY(SELECT DISTINCT proposal_id FROM new_rows));
      END IF;
      RETURN NULL;
    END $$;
    CREATE TRIGGER targets_plan_inputs_insert AFTER INSERT ON targets REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION plan_inputs_changed_by_targets();
    CREATE TRIGGER targets_plan_inputs_update AFTER UPDATE ON targets REFERENCING NEW TABLE AS new_rows
      FOR EACH STATEMENT EXECUTE FUNCTION plan_inputs_changed_by_targets();
    CREATE TRIGGER targets_plan_inputs_delete AFTER DELETE ON targets REFERENCING OLD TABLE AS old_rows
      FOR EACH STATEMENT EXECUTE FUNCTION plan_inputs_changed_by_targets();

    CREATE FUNCTION plan_inputs_changed_by_proposal_nodes() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM plan_inputs_changed(ARRAY[CASE WHEN TG_OP = 'DELETE' THEN OLD.proposal_id ELSE NEW.proposal_id END]);
      RETURN NULL;
    END $$;
    CREATE TRIGGER proposal_nodes_plan_inputs AFTER INSERT OR UPDATE OR DELETE ON proposal_nodes
      FOR EACH ROW EXECUTE FUNCTION plan_inputs_changed_by_proposal_nodes();

    CREATE FUNCTION plan_inputs_changed_by_proposal() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM plan_inputs_changed(ARRAY[NEW.id]);
      RETURN NULL;
    END $$;
    CREATE TRIGGER proposals_plan_inputs AFTER UPDATE OF completeness, cycle_id ON proposals
      FOR EACH ROW WHEN (OLD.completeness IS DISTINCT FROM NEW.completeness OR OLD.cycle_id IS DISTINCT FROM NEW.cycle_id)
      EXECUTE FUNCTION plan_inputs_changed_by_proposal();

    CREATE FUNCTION plan_inputs_changed_by_cycle() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM plan_inputs_changed(ARRAY(SELECT id FROM proposals WHERE cycle_id = NEW.id));
      RETURN NULL;
    END $$;
    CREATE TRIGGER cycles_plan_inputs AFTER UPDATE OF campaign_start, campaign_end ON cycles
      FOR EACH ROW WHEN (OLD.campaign_start IS DISTINCT FROM NEW.campaign_start OR OLD.campaign_end IS DISTINCT FROM NEW.campaign_end)
      EXECUTE FUNCTION plan_inputs_changed_by_cycle();

    CREATE FUNCTION plan_inputs_changed_by_node() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM plan_inputs_changed(ARRAY(SELECT proposal_id FROM proposal_nodes WHERE node_id = NEW.id));
      RETURN NULL;
    END $$;
    CREATE TRIGGER nodes_plan_inputs AFTER UPDATE ON nodes
      FOR EACH ROW WHEN (OLD IS DISTINCT FROM NEW) EXECUTE FUNCTION plan_inputs_changed_by_node();

    CREATE FUNCTION plan_inputs_changed_by_site() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      PERFORM plan_inputs_changed(ARRAY(SELECT pn.proposal_id FROM proposal_nodes pn JOIN nodes n ON n.id = pn.node_id WHERE n.site_id = NEW.id));
      RETURN NULL;
    END $$;
    CREATE TRIGGER sites_plan_inputs AFTER UPDATE ON sites
      FOR EACH ROW WHEN (OLD IS DISTINCT FROM NEW) EXECUTE FUNCTION plan_inputs_changed_by_site();
  `);
}

/** Drops the triggers, the cache columns and the summaries. */
export async function down(knex: Knex): Promise<void> {
  await knex.raw(`
    DROP TRIGGER sites_plan_inputs ON sites;
    DROP TRIGGER nodes_plan_inputs ON nodes;
    DROP TRIGGER cycles_plan_inputs ON cycles;
    DROP TRIGGER proposals_plan_inputs ON proposals;
    DROP TRIGGER proposal_nodes_plan_inputs ON proposal_nodes;
    DROP TRIGGER targets_plan_inputs_insert ON targets;
    DROP TRIGGER targets_plan_inputs_update ON targets;
    DROP TRIGGER targets_plan_inputs_delete ON targets;
    DROP FUNCTION plan_inputs_changed_by_site();
    DROP FUNCTION plan_inputs_changed_by_node();
    DROP FUNCTION plan_inputs_changed_by_cycle();
    DROP FUNCTION plan_inputs_changed_by_proposal();
    DROP FUNCTION plan_inputs_changed_by_proposal_nodes();
    DROP FUNCTION plan_inputs_changed_by_targets();
    DROP FUNCTION plan_inputs_changed(int[]);
  `);
  await knex.schema.alterTable('plan_runs', (t) => {
    t.dropColumn('current_hash_model');
    t.dropColumn('current_hash');
    t.dropColumn('inputs_version');
  });
  await knex.raw('ALTER TABLE target_plans DROP CONSTRAINT target_plans_summary_check');
  await knex.schema.alterTable('target_plans', (t) => {
    t.dropColumn('summary');
  });
}
