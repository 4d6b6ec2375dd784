import { defineConfig } from 'vitest/config';

// Under CI=true a JSON report is written too; .ci/run reads its counts for the closing line.
const ci = process.env.CI === 'true';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    reporters: ci ? ['default', ['json', { outputFile: 'test-artifacts/vitest.json' }]] : ['default'],
  },
});
