import { defineConfig } from 'vitest/config';
import { defaultServerConditions } from 'vite';

// Tests run the workspace from its TypeScript source: every package's `exports` has a `source`
// condition beside the built files' `types` and `import`, so no build sits between an edit and a
// test run. Users and the shipped packages never see that condition.
const conditions = ['source', ...defaultServerConditions];

export default defineConfig({
  resolve: { conditions },
  ssr: { resolve: { conditions, externalConditions: ['source'] } },
  test: {
    include: ['packages/*/test/**/*.test.ts', 'test/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
  },
});
