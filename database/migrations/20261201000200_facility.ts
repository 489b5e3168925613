import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('sites', (t) => {
    t.increments('id').primary();
    t.text('code').notNullable().unique();
    t.text('name').notNullable();
    t.double('latitude_deg').notNullable();
    t.double('longitude_deg').notNullable();
    t.double('elevation_m').notNullable();
    t.text('time_zone').notNullable();
    t.double('sky_brightness_mag_per_arcsec2').notNullable();
    t.timestamps(true, true);
    t.check('latitude_deg BETWEEN -90 AND 90', [], 'sites_latitude_check');
    t.check('longitude_deg BETWEEN -180 AND 180', [], 'sites_longitude_check');
    t.check('elevation_m BETWEEN -500 AND 6000', [], 'sites_elevation_check');
  });

  await knex.schema.createTable('nodes', (t) => {
    t.increments('id').primary();
    t.text('code').notNullable().unique();
    t.text('name').notNullable();
    t.integer('site_id').notNullable().references('sites.id').onDelete('RESTRICT');
    t.double('aperture_m').notNullable();
    t.double('obstruction_fraction').notNullable().defaultTo(0);
    t.double('throughput').notNullable();
    t.text('band').notNullable();
    t.double('read_noise_e').notNullable();
    t.double('dark_current_e_per_s').notNullable();
    t.double('gain_e_per_adu').notNullable();
    t.double('saturation_e').notNullable();
    t.double('pixel_scale_arcsec').notNullable();
    t.double('seeing_fwhm_arcsec').notNullable();
    t.double('systematic_floor_mmag').notNullable();
    t.text('scintillation_model').notNullable();
    t.double('overhead_seconds').notNullable();
    t.double('min_exposure_seconds').notNullable();
    t.double('max_exposure_seconds').notNullable();
    t.double('altitude_limit_deg').notNullable();
    t.double('sun_altitude_limit_deg').notNullable().defaultTo(-18);
    t.double('weather_loss_fraction').notNullable();
    t.integer('rate_minor_per_hour').notNullable();
    t.string('currency', 3).notNullable();
    t.boolean('active').notNullable().defaultTo(true);
    t.timestamps(true, true);
    t.check('aperture_m > 0 AND aperture_m <= 10', [], 'nodes_aperture_check');
    t.check('obstruction_fraction >= 0 AND obstruction_fraction < 1', [], 'nodes_obstruction_check');
    t.check('throughput > 0 AND throughput <= 1', [], 'nodes_throughput_check');
    t.check("band IN ('B', 'V', 'R', 'I', 'G')", [], 'nodes_band_check');
    t.check("scintillation_model IN ('young1967', 'osborn2015')", [], 'nodes_scintillation_check');
    t.check('altitude_limit_deg BETWEEN 0 AND 89', [], 'nodes_altitude_limit_check');
    t.check('sun_altitude_limit_deg BETWEEN -24 AND -6', [], 'nodes_sun_limit_check');
    t.check('weather_loss_fraction >= 0 AND weather_loss_fraction < 1', [], 'nodes_weather_check');
    t.check('rate_minor_per_hour >= 0', [], 'nodes_rate_check');
    t.check('min_exposure_seconds > 0 AND max_exposure_seconds >= min_exposure_seconds', [], 'nodes_exposure_check');
  });

  await knex.schema.createTable('cycles', (t) => {
    t.increments('id').primary();
    t.text('code').notNullable().unique();
    t.text('title').notNullable();
    t.timestamp('call_opens_at', { useTz: true }).notNullable();
    t.timestamp('call_closes_at', { useTz: true }).notNullable();
    t.date('campaign_start').notNullable();
    t.date('campaign_end').notNullable();
    t.boolean('anonymous_review').notNullable().defaultTo(false);
    t.specificType('categories', 'text[]').notNullable().defaultTo('{}');
    t.integer('created_by').references('accounts.id').onDelete('SET NULL');
    // Optimistic concurrency: every update increments it and must name the version it read.
    t.integer('version').notNullable().defaultTo(1);
    t.timestamps(true, true);
    t.check('call_closes_at > call_opens_at', [], 'cycles_call_check');
    t.check('campaign_end >= campaign_start', [], 'cycles_campaign_check');
  });

  // Capacity: node-hours each participating node offers in the cycle (awards draw on it).
  await knex.schema.createTable('cycle_nodes', (t) => {
    t.integer('cycle_id').notNullable().references('cycles.id').onDelete('CASCADE');
    t.integer('node_id').notNullable().references('nodes.id').onDelete('RESTRICT');
    t.decimal('node_hours_available', 10, 2).notNullable();
    t.primary(['cycle_id', 'node_id']);
    t.check('node_hours_available >= 0', [], 'cycle_nodes_hours_check');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('cycle_nodes');
  await knex.schema.dropTable('cycles');
  await knex.schema.dropTable('nodes');
  await knex.schema.dropTable('sites');
}
