import { describe, it, expect } from 'vitest';
import * as api from '../src/index.ts';

describe('@codeweir/stats univariate surface', () => {
  it('keeps every univariate export (a removal here is a change of contract)', () => {
    expect(Object.keys(api)).toEqual(
      expect.arrayContaining([
        'sortedCopy', 'quantile', 'quantileSorted', 'tukeyFences', 'OUTLIER_MULTIPLIER', 'EXTREME_MULTIPLIER',
        'Moments', 'skewness', 'kurtosis', 'geometricMean', 'coefficientOfVariation', 'cvFromMoments',
        'modes', 'modesSorted', 'modeIndices', 'frequencies', 'histogramSorted', 'MAX_BINS',
        'groupedMedian', 'classBoundaries', 'weightedMean', 'weightedSd', 'weightedMoments', 'weightedQuantile', 'weightedQuantiles',
      ]),
    );
  });
});
