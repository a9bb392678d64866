// The service is an ES module package (NestJS 12 ships only ES modules), so jest runs it in
// ESM mode: run it with NODE_OPTIONS=--experimental-vm-modules (scripts/test.sh and
// `npm test -w service` do).
/** @type {import('jest').Config} */
export default {
  testEnvironment: 'node',
  roots: ['<rootDir>/src', '<rootDir>/test'],
  testMatch: ['**/*.test.ts'],
  extensionsToTreatAsEsm: ['.ts'],
  transform: {
    '^.+\\.ts$': [
      'ts-jest',
      { tsconfig: '<rootDir>/tsconfig.json', isolatedModules: true, useESM: true },
    ],
  },
  moduleNameMapper: {
    // The engine is consumed as built, exactly as the service runs it (CommonJS imported from
    // ESM); scripts/test.sh builds it first, or run `npm run build -w shared`.
    '^@foldfolio/shared$': '<rootDir>/../shared/dist/index.js',
    // ESM sources import siblings as './x.js'; jest resolves the .ts file
    '^(\\.{1,2}/.*)\\.js$': '$1',
  },
  testTimeout: 120000,
  maxWorkers: 2,
};
