import { describe, expect, it } from 'vitest';
import * as read from '../src/index.ts';

describe('public surface of @codeweir/read', () => {
  it('exports exactly these values', () => {
    // The contract other packages code against; a change here is a change of contract.
    expect(Object.keys(read).sort()).toEqual([
      'DEFAULT_BATCH_FIELDS',
      'DEFAULT_BLOCK_SIZE',
      'DEFAULT_MAX_FIELD_BYTES',
      'FORMATS',
      'cellText',
      'formatOf',
      'normalizeReadOptions',
      'openAnyDelivery',
      'openDelivery',
      'openDeliveryRange',
      'readDeliveryText',
      'splitDelivery',
      'tokenizeFile',
      'typeNotes',
    ]);
  });
});
