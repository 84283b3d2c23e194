// The layers' dependency rules (#11 item 4), checked by `npm run lint:deps`, which `npm test` runs
// first. shared/ is used by the browser and the server alike, so it depends on neither; the
// server's core (HTTP plumbing, policies, uploads) depends on nothing else of the server; nothing the app ships
// imports test helpers.
/** @type {import('dependency-cruiser').IConfiguration} */
module.exports = {
  forbidden: [
    {
      name: 'shared-stands-alone',
      comment: 'shared/ is TypeScript for both the browser and the server: it imports neither.',
      severity: 'error',
      from: { path: '^shared/' },
      to: { path: '^(server|src|e2e|bench|scripts)/' },
    },
    {
      name: 'core-at-the-bottom',
      comment: 'server/core (HTTP plumbing, policies, uploads) is the lowest server layer: it imports only shared/ and itself.',
      severity: 'error',
      from: { path: '^server/core/', pathNot: '\\.spec\\.ts$' },
      to: { path: '^server/', pathNot: '^server/(core|types)/' },
    },
    {
      name: 'app-code-not-on-test-helpers',
      comment: 'Code that ships (not specs, drills or test helpers) does not import test helpers.',
      severity: 'error',
      from: { path: '^(server|shared|src)/', pathNot: '(\\.spec\\.ts|\\.drill\\.ts|/testing/)' },
      to: { path: '/testing/' },
    },
    {
      name: 'browser-not-on-server',
      comment: 'The Angular app talks to the server over HTTP only.',
      severity: 'error',
      from: { path: '^src/' },
      to: { path: '^server/' },
    },
    {
      name: 'no-circular',
      comment: 'Import cycles make load order matter and layers blur.',
      severity: 'error',
      from: {},
      to: { circular: true },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: '(^|/)(node_modules|dist|out-tsc|test-results|playwright-report)/' },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.server.json' },
    enhancedResolveOptions: { exportsFields: ['exports'], conditionNames: ['import', 'require', 'node', 'default', 'types'] },
  },
};
