import { describe, expect, it } from 'vitest';
import * as sql from '../src/index.ts';

describe('public surface of @codeweir/sql', () => {
  it('exports exactly these values', () => {
    // The contract other packages code against; a change here is a change of contract.
    expect(Object.keys(sql).sort()).toEqual(['DIALECTS', 'celToSql', 'checkWithDuckDb', 'checkWithEngine', 'checkWithPostgres', 'compileCheckSql', 'dialectOf', 'ident', 'lit', 'resultFromSql', 'sqlScript']);
  });
});
