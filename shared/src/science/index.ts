/** The science core: pure functions, no I/O. See SCIENCE.md for formulas and sources. */
export * from './science-input-error';
export * from './explained';
export * from './colour-sequence';
export * from './turnover-time';
export * from './gyrochronology';
export * from './spot-amplitude';
export * from './photometric-bands';
export * from './visit-precision';
export * from './detection';
export * from './target-plan';
export * from './seeded-random';
export * from './lomb-scargle/index';
