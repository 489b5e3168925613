/** Returned photometry: rotation measurement, alias check, verdict, implied and cluster ages, time systems. */
export * from './time-systems';
export * from './detrend';
export * from './window-function';
export * from './search-band';
export * from './alias-check';
export * from './verdict';
export * from './charts';
export * from './implied-age';
export * from './cluster-age';
export * from './double-period';
export {
  ROTATION_MODEL_VERSION,
  MIN_MEASURE_POINTS,
  PERIOD_UNCERTAINTY_SOURCE,
  type MeasureInput,
  type MeasureContext,
  measureRotation,
} from './measure-rotation';
