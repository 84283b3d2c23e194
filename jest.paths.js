// The import aliases of tsconfig.json's paths (`@shared/…`), as jest module mappings: both jest
// configurations read them from the tsconfig, so the alias is written in one place.
const { pathsToModuleNameMapper } = require('ts-jest');
const { compilerOptions } = require('./tsconfig.json');

module.exports = { moduleNameMapper: pathsToModuleNameMapper(compilerOptions.paths, { prefix: '<rootDir>/' }) };
