/** @type {import('jest').Config} */
module.exports = {
  testEnvironment: 'node',
  roots: ['<rootDir>/src', '<rootDir>/test'],
  testMatch: ['**/*.test.ts'],
  transform: { '^.+\\.ts$': ['ts-jest', { tsconfig: '<rootDir>/tsconfig.json', isolatedModules: true }] },
  // the engine is consumed from its sources so tests never need a stale build
  moduleNameMapper: { '^@foldfolio/shared$': '<rootDir>/../shared/src/index.ts' },
  testTimeout: 120000,
  maxWorkers: 2,
};
