// One jest configuration with one project per suite; `npm test` (test/run-all.mjs) runs
// each project separately so that its summary can name the suite.
const swc = [
  '@swc/jest',
  {
    jsc: { parser: { syntax: 'typescript' }, target: 'es2022' },
    module: { type: 'commonjs' },
  },
];
const nodeProject = (name, roots, extra = {}) => ({
  displayName: name,
  testEnvironment: 'node',
  roots,
  testMatch: ['**/*.spec.ts'],
  transform: { '^.+\\.(t|j)s$': swc },
  moduleNameMapper: { '^@spincycle/shared/(.*)$': '<rootDir>/shared/src/$1' },
  ...extra,
});

module.exports = {
  projects: [
    nodeProject('shared', ['<rootDir>/shared']),
    nodeProject('reference', ['<rootDir>/test/reference']),
    nodeProject('server', ['<rootDir>/server', '<rootDir>/test/api', '<rootDir>/fakes', '<rootDir>/database'], {
      setupFiles: ['<rootDir>/test/support/server-env.ts'],
      globalSetup: '<rootDir>/test/support/server-global-setup.ts',
      globalTeardown: '<rootDir>/test/support/server-global-teardown.ts',
    }),
    {
      displayName: 'client',
      preset: 'jest-preset-angular',
      roots: ['<rootDir>/client/src'],
      setupFilesAfterEnv: ['<rootDir>/client/setup-jest.ts'],
      testEnvironment: 'jsdom',
      moduleNameMapper: { '^@spincycle/shared/(.*)$': '<rootDir>/shared/src/$1' },
      transform: {
        '^.+\\.(ts|js|mjs|html|svg)$': [
          'jest-preset-angular',
          { tsconfig: '<rootDir>/client/tsconfig.spec.json', stringifyContentPathRegex: '\\.(html|svg)$' },
        ],
      },
      transformIgnorePatterns: ['node_modules/(?!.*\\.mjs$)'],
    },
    nodeProject('browser', ['<rootDir>/test/e2e'], {
      globalSetup: '<rootDir>/test/e2e/support/global-setup.ts',
      globalTeardown: '<rootDir>/test/e2e/support/global-teardown.ts',
      setupFilesAfterEnv: ['<rootDir>/test/e2e/support/timeouts.ts'],
    }),
  ],
};
