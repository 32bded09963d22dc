import { describe, it, expect } from 'vitest';
import * as api from '../src/index.ts';

describe('public surface of @codeweir/interchange', () => {
  it('exports exactly these runtime names (a change here is a change of the contract)', () => {
    expect(Object.keys(api).sort()).toEqual([
      'BIN_TEXT', 'NOTE', 'SHEETS', 'codebookFromDdi', 'codebookFromVariableList', 'ddiFromCodebook', 'formatBounds', 'formatEntry',
      'importCodebook', 'importFormatOf', 'kindFromLabel', 'parseBounds', 'parseListCell', 'readVariableListCsv', 'readVariableListXlsx',
      'variableListFromCodebook', 'variableListXlsx',
    ]);
  });

  it('reads the kind of a missing code from the usual wording (common practice), and nothing from other words', () => {
    expect(api.kindFromLabel("Don't know")).toBe('dont-know');
    expect(api.kindFromLabel('Refused to answer')).toBe('refused');
    expect(api.kindFromLabel('Not applicable')).toBe('not-applicable');
    expect(api.kindFromLabel('No answer')).toBe('omitted');
    expect(api.kindFromLabel('Two boxes ticked')).toBe('invalid');
    expect(api.kindFromLabel('Tap water')).toBeUndefined();
  });
});
