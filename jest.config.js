/** @type {import('jest').Config} */
module.exports = {
  testEnvironment: 'node',
  transform: { '^.+\\.tsx?$': ['ts-jest', { tsconfig: 'tsconfig.json' }] },
  testMatch: ['<rootDir>/test/**/*.test.ts'],
  moduleFileExtensions: ['ts', 'js', 'json'],
  testTimeout: 60000,
  setupFilesAfterEnv: ['<rootDir>/test/support/matchers.ts'],
  reporters: ['default', '<rootDir>/test/support/summary-reporter.js'],
};
