import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';

setupZonelessTestEnv();

// jsdom has no canvas; chart.js only needs a context object that accepts calls.
Object.defineProperty(HTMLCanvasElement.prototype, 'getContext', {
  value: () => null,
});
