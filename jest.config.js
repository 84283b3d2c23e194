// Three projects: the pure shared code in Node with no services (`npm run test:unit`, seconds),
// the server in Node (real PostgreSQL, real SMTP), and the Angular components in jsdom
// (jest-preset-angular, zoneless).
const { createCjsPreset } = require('jest-preset-angular/presets');

const { moduleNameMapper } = require('./jest.paths');

/** @type {import('jest').Config} */
module.exports = {
  testTimeout: 30000,
  projects: [
    {
      displayName: 'shared',
      testEnvironment: 'node',
      roots: ['<rootDir>/shared'],
      testMatch: ['**/*.spec.ts'],
      transform: {
        '^.+\\.(ts|js|mjs)$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
      },
      transformIgnorePatterns: ['/node_modules/(?!(pixelmatch|colorjs\\.io)/)'],
    },
    {
      displayName: 'server',
      testEnvironment: 'node',
      roots: ['<rootDir>/server'],
      testMatch: ['**/*.spec.ts'],
      transform: {
        '^.+\\.(ts|js|mjs)$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
      },
      // pixelmatch is an ES module only: let ts-jest transform it.
      transformIgnorePatterns: ['/node_modules/(?!(pixelmatch|colorjs\\.io)/)'],
      globalSetup: '<rootDir>/server/testing/global-setup.ts',
      moduleNameMapper,
    },
    {
      displayName: 'client',
      ...createCjsPreset({ tsconfig: '<rootDir>/tsconfig.spec.json' }),
      roots: ['<rootDir>/src'],
      testMatch: ['**/*.spec.ts'],
      setupFilesAfterEnv: ['<rootDir>/src/test-setup.ts'],
      moduleNameMapper,
    },
  ],
};
