import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { isUtf8 } from 'node:buffer';
import iconv from 'iconv-lite';
import { decodeWindows1252, encodedLength, firstInvalidUtf8, makeDecoder } from '../src/decode.ts';
import { utf8Length } from '../src/tokenizer.ts';

describe('UTF-8 handling against Node Buffer as the oracle', () => {
  it('decodes valid text cut into arbitrary blocks exactly as one Buffer decode', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 40 }), fc.array(fc.integer({ min: 1, max: 7 }), { minLength: 1, maxLength: 10 }), (s, cuts) => {
        const bytes = Buffer.from(s, 'utf8');
        const d = makeDecoder('utf-8');
        let out = '';
        let pos = 0;
        for (let k = 0; pos < bytes.length; k++) {
          const next = Math.min(bytes.length, pos + (cuts[k % cuts.length] as number));
          out += d.decode(bytes.subarray(pos, next), next >= bytes.length);
          pos = next;
        }
        expect(out).toBe(bytes.toString('utf8'));
        expect(utf8Length(s)).toBe(Buffer.byteLength(s, 'utf8'));
        expect(encodedLength(s, 'utf-8')).toBe(bytes.length);
      }),
      { numRuns: 300 },
    );
  });

  it('finds the first invalid byte where Node stops accepting the prefix', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 24 }), (raw) => {
        // Up to three leading continuation bytes finish a character of the previous block and
        // are skipped by design, so the oracle judges the bytes after them.
        let skip = 0;
        while (skip < 3 && skip < raw.length && ((raw[skip] as number) & 0xc0) === 0x80) skip++;
        const bytes = raw.subarray(skip);
        const found = firstInvalidUtf8(raw);
        const at = found === -1 ? -1 : found - skip;
        if (at === -1) {
          // Valid, or invalid only through a sequence cut by the end (judged with the next block).
          const ok = [0, 1, 2, 3].some((k) => k <= bytes.length && isUtf8(bytes.subarray(0, bytes.length - k)));
          expect(ok).toBe(true);
        } else {
          expect(isUtf8(bytes.subarray(0, at))).toBe(true);
          expect(isUtf8(bytes.subarray(0, Math.min(bytes.length, at + 4)))).toBe(false);
        }
      }),
      { numRuns: 500 },
    );
  });

  it('throws on invalid UTF-8 instead of producing replacement characters', () => {
    // 0xFF never occurs in UTF-8 (RFC 3629).
    expect(() => makeDecoder('utf-8').decode(Uint8Array.from([0x61, 0xff]), true)).toThrow(TypeError);
  });
});

describe('windows-1252 against iconv-lite as the oracle', () => {
  it('decodes any bytes as iconv-lite does', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 64 }), (bytes) => {
        expect(decodeWindows1252(bytes)).toBe(iconv.decode(Buffer.from(bytes), 'windows-1252', { stripBOM: false }));
      }),
      { numRuns: 500 },
    );
    const all = Uint8Array.from({ length: 256 }, (_, i) => i);
    expect(decodeWindows1252(all)).toBe(iconv.decode(Buffer.from(all), 'windows-1252', { stripBOM: false }));
  });
});
