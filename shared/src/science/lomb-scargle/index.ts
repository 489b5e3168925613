export * from './light-curve';
export * from './frequency-grid';
export * from './lomb-scargle-power';
export * from './false-alarm';
export * from './periodogram';
