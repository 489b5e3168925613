/**
 * Sky windows: 1000 targets × 3 sites × 180 nights with the fast path (target ≤ 1 s on one
 * core), beside astropy doing a small sample of the same work on a 1-minute grid, extrapolated.
 */
import { seededRandom } from '../../shared/src/science/seeded-random';
import { computeSkyWindows } from '../../shared/src/sky/sky-windows';
import type { SkySite, SkyTarget } from '../../shared/src/sky/sky-types';
import { runAstropyOracle } from '../reference/astropy-oracle';

const SITES: SkySite[] = [
  { latitudeDeg: 31.96, longitudeDeg: -111.6, elevationM: 2096, timeZone: 'America/Phoenix' },
  { latitudeDeg: -30.2, longitudeDeg: -70.8, elevationM: 2200, timeZone: 'America/Santiago' },
  { latitudeDeg: -31.3, longitudeDeg: 150.0, elevationM: 1100, timeZone: 'Australia/Sydney' },
];
const CAMPAIGN = { firstNight: '2025-01-01', lastNight: '2025-06-29' }; // 180 nights
const LIMITS = { altitudeLimitDeg: 30, moonSeparationMinDeg: 30 };

/** Seeded uniform targets over the sphere. */
function randomTargets(count: number, seed: number): SkyTarget[] {
  const r = seededRandom(seed);
  return Array.from({ length: count }, (_, i) => ({
    name: `B${i}`,
    raDeg: r.uniform(0, 360),
    decDeg: (Math.asin(r.uniform(-1, 1)) * 180) / Math.PI,
  }));
}

/** Wall-clock and process CPU time (all threads, incl. GC and compiler threads), ms. */
function timeFullJob(targets: SkyTarget[]): { wallMs: number; cpuMs: number } {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  for (const site of SITES) computeSkyWindows({ site, limits: LIMITS, campaign: CAMPAIGN, targets });
  const wallMs = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  return { wallMs, cpuMs: (cpu.user + cpu.system) / 1000 };
}

const ASTROPY_SAMPLE = String.raw`
import json, sys, time, warnings
t_start = time.perf_counter()
warnings.filterwarnings('ignore')
from astropy.utils import iers
iers.conf.auto_download = False
iers.conf.auto_max_age = None
iers.conf.iers_degraded_accuracy = 'warn'
import numpy as np
import astropy.units as u
from astropy.time import Time
from astropy.coordinates import SkyCoord, EarthLocation, AltAz, get_sun
t_imported = time.perf_counter()
req = json.load(sys.stdin)
loc = EarthLocation(lat=req['lat'] * u.deg, lon=req['lon'] * u.deg, height=req['height'] * u.m)
targets = SkyCoord(ra=np.array(req['ra']) * u.deg, dec=np.array(req['dec']) * u.deg, frame='icrs')
sun_s = 0.0
tgt_s = 0.0
hours = []
for start in req['windowStarts']:
    times = Time(start, scale='utc') + np.arange(1441) * u.min
    t0 = time.perf_counter()
    sun = get_sun(times).transform_to(AltAz(obstime=times, location=loc)).alt.deg
    t1 = time.perf_counter()
    alts = targets[None, :].transform_to(AltAz(obstime=times[:, None], location=loc)).alt.deg
    dark = sun <= -18
    hours.append([float(np.sum(dark & (alts[:, j] >= 30)) / 60.0) for j in range(alts.shape[1])])
    t2 = time.perf_counter()
    sun_s += t1 - t0
    tgt_s += t2 - t1
print(json.dumps({'importSeconds': t_imported - t_start, 'sunSeconds': sun_s, 'targetSeconds': tgt_s, 'hours': hours}))
`;

interface AstropySample {
  importSeconds: number;
  sunSeconds: number;
  targetSeconds: number;
  hours: number[][];
}

export default async function benchSkyWindows(): Promise<void> {
  const targets = randomTargets(1000, 20250101);
  const cold = timeFullJob(targets);
  const warmRuns = [timeFullJob(targets), timeFullJob(targets), timeFullJob(targets)].sort((a, b) => a.wallMs - b.wallMs);
  const warm = warmRuns[1].wallMs;
  const sharedRuns = [timeFullJob([]), timeFullJob([]), timeFullJob([])].sort((a, b) => a.wallMs - b.wallMs);
  const sharedOnly = sharedRuns[1].wallMs;
  const targetNights = 1000 * 3 * 180;
  const fmt = (r: { wallMs: number; cpuMs: number }) => `${r.wallMs.toFixed(0)} ms (process CPU ${r.cpuMs.toFixed(0)} ms)`;
  console.log(
    `fast path, 1000 targets × 3 sites × 180 nights (${targetNights.toLocaleString('en')} target-nights, Moon check on), one thread:`,
  );
  console.log(`  first run in a fresh process (cold JIT): ${fmt(cold)}   [target ≤ 1000 ms]`);
  console.log(`  median of 3 warm runs:                   ${fmt(warmRuns[1])}   [target ≤ 1000 ms]`);
  console.log(
    `  of which Sun + Moon per site-night (540 site-nights, warm): ${sharedOnly.toFixed(0)} ms; per target-night: ${(((warm - sharedOnly) * 1e6) / targetNights).toFixed(0)} ns`,
  );

  // astropy: 5 targets × 1 site × 5 nights, each night's 24-h window on a 1-minute grid (1441 instants).
  const sampleTargets = targets.slice(0, 5);
  const sampleNights = { firstNight: '2025-01-01', lastNight: '2025-01-05' };
  const ours = computeSkyWindows({
    site: SITES[0],
    limits: { altitudeLimitDeg: 30, refraction: 'none' },
    campaign: sampleNights,
    targets: sampleTargets,
  });
  const request = {
    lat: SITES[0].latitudeDeg,
    lon: SITES[0].longitudeDeg,
    height: SITES[0].elevationM,
    windowStarts: ours.nights.map((n) => new Date(n.windowStartUtcMs).toISOString().replace('Z', '')),
    ra: sampleTargets.map((t) => t.raDeg),
    dec: sampleTargets.map((t) => t.decDeg),
  };
  let sample: AstropySample;
  try {
    sample = runAstropyOracle<AstropySample>(request, ['-c', ASTROPY_SAMPLE]);
  } catch (err) {
    console.log(`astropy sample not run: ${((err as Error).message.trim().split('\n').pop() ?? '').slice(0, 300)}`);
    return;
  }
  const sunScale = (3 * 180) / (1 * 5); // site-nights
  const targetScale = (1000 * 3 * 180) / (5 * 1 * 5); // target-nights
  const extrapolatedSeconds = sample.sunSeconds * sunScale + sample.targetSeconds * targetScale;
  let worstHours = 0;
  sample.hours.forEach((row, n) =>
    row.forEach((h, j) => (worstHours = Math.max(worstHours, Math.abs(h - ours.targets[j].usableHoursByNight[n])))),
  );
  console.log('astropy 5.2.1, 5 targets × 1 site × 5 nights, AltAz of Sun and targets on a 1-minute grid (1441 instants per 24-h window):');
  console.log(
    `  Sun ${(sample.sunSeconds * 1000).toFixed(0)} ms + targets ${(sample.targetSeconds * 1000).toFixed(0)} ms (python start-up and imports ${(sample.importSeconds * 1000).toFixed(0)} ms, not counted)`,
  );
  console.log(
    `  extrapolated to the full job: Sun × ${sunScale} site-nights + targets × ${targetScale} target-nights = ${extrapolatedSeconds.toFixed(0)} s`,
  );
  console.log(
    `  ratio astropy (extrapolated) / fast path (warm): ${Math.round((extrapolatedSeconds * 1000) / warm).toLocaleString('en')}×`,
  );
  console.log(`  sample agreement: largest difference in usable hours ${worstHours.toFixed(3)} h (1-minute grid resolution)`);
}
