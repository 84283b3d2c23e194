// Two projects: the server and shared code in Node (real PostgreSQL, real SMTP), and the
// Angular components in jsdom (jest-preset-angular, zoneless).
const { createCjsPreset } = require('jest-preset-angular/presets');

/** @type {import('jest').Config} */
module.exports = {
  testTimeout: 30000,
  projects: [
    {
      displayName: 'server',
      testEnvironment: 'node',
      roots: ['<rootDir>/server', '<rootDir>/shared'],
      testMatch: ['**/*.spec.ts'],
      transform: {
        '^.+\\.(ts|js|mjs)$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }],
      },
      // pixelmatch is an ES module only: let ts-jest transform it.
      transformIgnorePatterns: ['/node_modules/(?!(pixelmatch|colorjs\\.io)/)'],
      globalSetup: '<rootDir>/server/testing/global-setup.ts',
    },
    {
      displayName: 'client',
      ...createCjsPreset({ tsconfig: '<rootDir>/tsconfig.spec.json' }),
      roots: ['<rootDir>/src'],
      testMatch: ['**/*.spec.ts'],
      setupFilesAfterEnv: ['<rootDir>/src/test-setup.ts'],
    },
  ],
};
