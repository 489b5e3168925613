import type { Knex } from 'knex';
import { addDays, formatISO, startOfDay } from 'date-fns';
import { insertAccount } from '../../server/src/features/accounts/account-repository';
import { hashPassword } from '../../server/src/features/auth/password-hash';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from '../demo-accounts';

/**
 * Demo data of an invented consortium, the Halcyon Night Array: three invented sites (two
 * northern, one southern), one node each, one open cycle, one account per role. Resets its
 * own tables. Dates are relative to the day of seeding so that the cycle is open whenever
 * the demo is set up.
 */
export async function seed(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    await trx.raw(
      'TRUNCATE cycle_nodes, cycles, nodes, sites, password_reset_tokens, account_roles, accounts, sessions RESTART IDENTITY CASCADE',
    );

    const passwordHash = await hashPassword(DEMO_PASSWORD);
    const accountIds: Record<string, number> = {};
    for (const a of DEMO_ACCOUNTS) accountIds[a.email] = await insertAccount(trx, { ...a, passwordHash });

    const sites = await trx('sites')
      .insert([
        {
          code: 'KRG',
          name: 'Kestrel Ridge',
          latitude_deg: 34.9012,
          longitude_deg: -108.4027,
          elevation_m: 2210,
          time_zone: 'America/Denver',
          sky_brightness_mag_per_arcsec2: 21.6,
        },
        {
          code: 'VHM',
          name: 'Vindelholm',
          latitude_deg: 42.0631,
          longitude_deg: 20.5048,
          elevation_m: 1650,
          time_zone: 'Europe/Belgrade',
          sky_brightness_mag_per_arcsec2: 21.2,
        },
        {
          code: 'PSR',
          name: 'Pampa Serena',
          latitude_deg: -27.4471,
          longitude_deg: -69.9522,
          elevation_m: 2380,
          time_zone: 'America/Santiago',
          sky_brightness_mag_per_arcsec2: 21.8,
        },
      ])
      .returning(['id', 'code']);
    const siteId = Object.fromEntries(sites.map((s: { id: number; code: string }) => [s.code, s.id]));

    const common = { dark_current_e_per_s: 0.02, gain_e_per_adu: 1.3, sun_altitude_limit_deg: -18, currency: 'eur', active: true };
    const nodes = await trx('nodes')
      .insert([
        {
          ...common,
          code: 'KRG-50',
          name: 'Kestrel 50',
          site_id: siteId.KRG,
          aperture_m: 0.5,
          obstruction_fraction: 0.4,
          throughput: 0.55,
          band: 'V',
          read_noise_e: 9,
          saturation_e: 80000,
          pixel_scale_arcsec: 0.8,
          seeing_fwhm_arcsec: 1.6,
          systematic_floor_mmag: 1.0,
          scintillation_model: 'osborn2015',
          overhead_seconds: 45,
          min_exposure_seconds: 2,
          max_exposure_seconds: 300,
          altitude_limit_deg: 25,
          weather_loss_fraction: 0.3,
          rate_minor_per_hour: 4500,
        },
        {
          ...common,
          code: 'VHM-40',
          name: 'Vindelholm 40',
          site_id: siteId.VHM,
          aperture_m: 0.4,
          obstruction_fraction: 0.45,
          throughput: 0.5,
          band: 'R',
          read_noise_e: 11,
          saturation_e: 60000,
          pixel_scale_arcsec: 1.1,
          seeing_fwhm_arcsec: 2.2,
          systematic_floor_mmag: 1.5,
          scintillation_model: 'osborn2015',
          overhead_seconds: 60,
          min_exposure_seconds: 2,
          max_exposure_seconds: 240,
          altitude_limit_deg: 30,
          weather_loss_fraction: 0.45,
          rate_minor_per_hour: 3000,
        },
        {
          ...common,
          code: 'PSR-100',
          name: 'Serena 100',
          site_id: siteId.PSR,
          aperture_m: 1.0,
          obstruction_fraction: 0.35,
          throughput: 0.6,
          band: 'R',
          read_noise_e: 6,
          saturation_e: 120000,
          pixel_scale_arcsec: 0.6,
          seeing_fwhm_arcsec: 1.1,
          systematic_floor_mmag: 0.7,
          scintillation_model: 'osborn2015',
          overhead_seconds: 40,
          min_exposure_seconds: 1,
          max_exposure_seconds: 300,
          altitude_limit_deg: 30,
          weather_loss_fraction: 0.15,
          rate_minor_per_hour: 12000,
        },
      ])
      .returning(['id', 'code']);

    const today = startOfDay(new Date());
    const campaignStart = addDays(today, 90);
    const semester = `${campaignStart.getUTCFullYear()}${campaignStart.getUTCMonth() < 6 ? 'A' : 'B'}`;
    const [cycle] = await trx('cycles')
      .insert({
        code: semester,
        title: `Spin-down monitoring ${semester}`,
        call_opens_at: addDays(today, -30),
        call_closes_at: addDays(today, 45),
        campaign_start: formatISO(campaignStart, { representation: 'date' }),
        campaign_end: formatISO(addDays(campaignStart, 179), { representation: 'date' }),
        anonymous_review: true,
        categories: ['Open clusters and associations', 'Field stars and planet hosts', 'Methods and calibration'],
        created_by: accountIds['manager@halcyon.example'],
      })
      .returning('id');
    const hours: Record<string, number> = { 'KRG-50': 620, 'VHM-40': 480, 'PSR-100': 540 };
    await trx('cycle_nodes').insert(
      nodes.map((n: { id: number; code: string }) => ({ cycle_id: cycle.id, node_id: n.id, node_hours_available: hours[n.code] })),
    );
  });
}
