// The browser suite: run by scripts/test.mjs after it has started the real server (E2E_BASE_URL).
module.exports = {
  displayName: 'e2e',
  testEnvironment: 'node',
  testMatch: ['<rootDir>/__tests__/e2e/**/*.e2e.ts'],
  transform: { '^.+\\.tsx?$': ['ts-jest', { tsconfig: '<rootDir>/server/tsconfig.json' }] },
  testTimeout: 90_000,
};
