/**
 * Streaming decoders: bytes of one block in, text out, a multi-byte character cut by the block
 * end held back for the next block. UTF-8 is decoded strictly so a file saved in a legacy code
 * page is reported instead of silently turned into replacement characters.
 */
import iconv from 'iconv-lite';
import type { Encoding } from './types.ts';

export interface ChunkDecoder {
  /** Decodes one block; `final` flushes what is held. Throws TypeError on invalid UTF-8. */
  decode(bytes: Uint8Array, final: boolean): string;
}

export function makeDecoder(encoding: Encoding): ChunkDecoder {
  switch (encoding) {
    case 'utf-8':
    case 'utf-16le':
    case 'utf-16be': {
      const d = new TextDecoder(encoding, { fatal: encoding === 'utf-8', ignoreBOM: true });
      return { decode: (bytes, final) => d.decode(bytes, { stream: !final }) };
    }
    case 'latin1':
      // ISO-8859-1 proper: every byte is the code point of the same value.
      return { decode: (bytes) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1') };
    case 'windows-1252': {
      const d = iconv.getDecoder('windows-1252', { stripBOM: false });
      return {
        decode: (bytes, final) => {
          const s = d.write(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength));
          return final ? s + (d.end() ?? '') : s;
        },
      };
    }
  }
}

/** Bytes that `text` occupies in `encoding` (for byte offsets of the header end). */
export function encodedLength(text: string, encoding: Encoding): number {
  if (encoding === 'utf-8') return Buffer.byteLength(text, 'utf8');
  if (encoding === 'utf-16le' || encoding === 'utf-16be') return 2 * text.length;
  return text.length;
}

/**
 * Index of the first byte of `bytes` that breaks UTF-8 (from `from`), or -1. Up to three
 * leading continuation bytes are skipped: they finish a character begun in the previous block.
 */
export function firstInvalidUtf8(bytes: Uint8Array, from = 0): number {
  let i = from;
  for (let k = 0; k < 3 && i < bytes.length && ((bytes[i] as number) & 0xc0) === 0x80; k++) i++;
  while (i < bytes.length) {
    const b = bytes[i] as number;
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let min: number;
    if (b >= 0xc2 && b <= 0xdf) {
      need = 1;
      min = 0x80;
    } else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      min = 0x800;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      min = 0x10000;
    } else return i;
    if (i + need >= bytes.length) {
      // A sequence cut by the end of the buffer is judged with the next block.
      for (let k = i + 1; k < bytes.length; k++) if (((bytes[k] as number) & 0xc0) !== 0x80) return i;
      return -1;
    }
    let cp = b & (0x3f >> need);
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k] as number;
      if ((c & 0xc0) !== 0x80) return i;
      cp = (cp << 6) | (c & 0x3f);
    }
    if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return i;
    i += need + 1;
  }
  return -1;
}
