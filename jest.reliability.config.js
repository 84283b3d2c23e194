// The reliability drills (`npm run test:reliability`): hostile uploads, crashes and a database
// outage against real server processes. They stop and start PostgreSQL, so they run alone, in band.
const { moduleNameMapper } = require('./jest.paths');

/** @type {import('jest').Config} */
module.exports = {
  displayName: 'reliability',
  testEnvironment: 'node',
  roots: ['<rootDir>/server/reliability'],
  testMatch: ['**/*.drill.ts'],
  testTimeout: 300_000,
  // Node's fetch keeps idle sockets to the drilled servers open for a few seconds after the last test.
  forceExit: true,
  maxWorkers: 1,
  transform: { '^.+\\.(ts|js|mjs)$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.server.json' }] },
  transformIgnorePatterns: ['/node_modules/(?!(pixelmatch|colorjs\\.io)/)'],
  moduleNameMapper,
};
