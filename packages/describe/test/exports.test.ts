import { describe as suite, it, expect } from 'vitest';
import * as api from '../src/index.ts';

suite('@codeweir/describe public surface', () => {
  it('exports exactly these runtime names (a change here is a change of contract)', () => {
    expect(Object.keys(api).sort()).toEqual(
      ['DESIGN_CONVENTIONS', 'OUTLIER_NOTE_SHARE', 'addDesignEstimates', 'designActive', 'designWeightName', 'conventionText', 'conventionsFor', 'describe', 'describeParallel', 'describePairs', 'normalizeDescribeOptions', 'suppressDescription', 'suppressItem', 'suppressPair', 'oneRow', 'hideFrequency', 'hideFrequencies'].sort(),
    );
  });
});
