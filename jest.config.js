// Two projects: the app runs under jest-expo (React Native web-ish renderer), the server and the
// shared domain library run in plain node through ts-jest with the server's decorator-enabled tsconfig.
module.exports = {
  // PDF rendering and bcrypt on a 2-core machine under load: the default 5 s per test is too tight.
  testTimeout: 30_000,
  projects: [
    {
      displayName: 'app',
      preset: 'jest-expo',
      testMatch: ['<rootDir>/__tests__/app/**/*.test.ts?(x)'],
      moduleNameMapper: { '^@/(.*)$': '<rootDir>/$1' },
    },
    {
      displayName: 'server',
      testEnvironment: 'node',
      testMatch: ['<rootDir>/__tests__/server/**/*.test.ts', '<rootDir>/__tests__/lib/**/*.test.ts'],
      transform: { '^.+\\.tsx?$': ['ts-jest', { tsconfig: '<rootDir>/server/tsconfig.json' }] },
    },
  ],
};
