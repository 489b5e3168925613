/**
 * The node and site `spincycle plan` uses unless given others: a typical 0.5 m robotic
 * telescope with a CCD in V at a 2000 m site (illustrative values, Spincycle's choice).
 */
import type { NodeSpec, SiteSpec } from '../facility/facility-types';

export const TYPICAL_NODE: NodeSpec = {
  apertureM: 0.5,
  obstructionFraction: 0.4,
  throughput: 0.45,
  band: 'V',
  readNoiseE: 9,
  darkCurrentEPerS: 0.02,
  gainEPerAdu: 1.4,
  saturationE: 50000,
  pixelScaleArcsec: 0.75,
  seeingFwhmArcsec: 2,
  systematicFloorMmag: 1,
  scintillationModel: 'osborn2015',
  overheadSeconds: 45,
  minExposureSeconds: 2,
  maxExposureSeconds: 300,
  altitudeLimitDeg: 30,
  sunAltitudeLimitDeg: -12,
  weatherLossFraction: 0.3,
  rateMinorPerHour: 6000,
  currency: 'eur',
};

export const TYPICAL_SITE: SiteSpec = {
  latitudeDeg: 30,
  longitudeDeg: -70,
  elevationM: 2000,
  timeZone: 'UTC',
  skyBrightnessMagPerArcsec2: 21.3,
};
