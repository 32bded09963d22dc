import { describe, it, expect } from 'vitest';
import * as api from '../src/index.ts';

describe('public surface of @codeweir/codebook', () => {
  it('exports exactly these runtime names (a change here is a change of the contract)', () => {
    expect(Object.keys(api).sort()).toEqual([
      'BinSchema', 'BoundsSchema', 'CHECKS', 'CodeSchema', 'CodeValueSchema', 'CodebookSchema', 'DesignSchema', 'DisclosureSchema', 'ExpressionContext',
      'ITEM_TYPES', 'ItemSchema', 'LEVELS', 'LabelSchema', 'LanguageTagSchema', 'MAX_EXPRESSION_DEPTH', 'MISSING_KINDS', 'MissingCodeSchema', 'MissingKindSchema',
      'PROBLEM_SEVERITY', 'ROLES', 'RULE_SEVERITIES', 'RuleSchema', 'SCHEMA_FILE_URL', 'ambiguousRepetition', 'analyseCodebook',
      'buildCompiled', 'canonicalNumberText', 'closest', 'codeKeys', 'codebookJsonSchema', 'codebookLanguages', 'compileCodebook', 'compileExpression',
      'compilePattern', 'daysSinceEpoch', 'didYouMean', 'editDistance', 'escapePointerToken', 'hasErrors', 'isUnsafePattern',
      'labelHas', 'labelText', 'lineColumn', 'loadCodebook', 'loadCodebookOrThrow', 'lookupCell', 'parseCodebook', 'pointer', 'problem', 'resolveLabels', 'resolveMissing',
      'scanJson', 'schemaFileText', 'validateWithShippedSchema',
    ]);
  });

  it('every registered meaning check has a name and a run function', () => {
    for (const c of api.CHECKS) {
      expect(c.name.length).toBeGreaterThan(0);
      expect(typeof c.run).toBe('function');
    }
  });
});
