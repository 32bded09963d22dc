/**
 * Streaming decoders: bytes of one block in, text out, a multi-byte character cut by the block
 * end held back for the next block. UTF-8 is decoded strictly so a file saved in a legacy code
 * page is reported instead of silently turned into replacement characters.
 */
import { isUtf8 } from 'node:buffer';
import iconv from 'iconv-lite';
import type { Encoding } from './types.ts';

export interface ChunkDecoder {
  /** Decodes one block; `final` flushes what is held. Throws TypeError on invalid UTF-8. */
  decode(bytes: Uint8Array, final: boolean): string;
}

export function makeDecoder(encoding: Encoding): ChunkDecoder {
  switch (encoding) {
    case 'utf-8':
      return utf8Decoder();
    case 'utf-16le':
    case 'utf-16be': {
      const d = new TextDecoder(encoding, { ignoreBOM: true });
      return { decode: (bytes, final) => d.decode(bytes, { stream: !final }) };
    }
    case 'latin1':
      // ISO-8859-1 proper: every byte is the code point of the same value.
      return { decode: (bytes) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1') };
    case 'windows-1252':
      return { decode: (bytes) => decodeWindows1252(bytes) };
  }
}

/** The 32 characters where windows-1252 differs from ISO-8859-1 (bytes 0x80-0x9F), from iconv-lite's table. */
const CP1252_HIGH = iconv.decode(Buffer.from(Array.from({ length: 32 }, (_, i) => 0x80 + i)), 'windows-1252', { stripBOM: false });
const C1 = /[\u0080-\u009f]/g;

/**
 * windows-1252 as a native ISO-8859-1 decode plus a fix-up of the bytes 0x80-0x9F, the only
 * ones where the two differ: the same characters as iconv-lite's decoder, several times faster on
 * large blocks. A single-byte code page never splits a character across blocks.
 */
export function decodeWindows1252(bytes: Uint8Array): string {
  const s = Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('latin1');
  C1.lastIndex = 0;
  return C1.test(s) ? s.replace(C1, (c) => CP1252_HIGH[c.charCodeAt(0) - 0x80] as string) : s;
}

/**
 * Strict UTF-8: a native validity check and a native decode of each block, several times faster
 * than a fatal TextDecoder. The bytes of a character cut by the block end wait for the next block.
 */
function utf8Decoder(): ChunkDecoder {
  let held = new Uint8Array(0);
  return {
    decode(bytes, final) {
      let buf = bytes;
      if (held.length > 0) {
        buf = new Uint8Array(held.length + bytes.length);
        buf.set(held);
        buf.set(bytes, held.length);
      }
      let cut = buf.length;
      if (!final) {
        let i = buf.length - 1;
        for (let k = 0; k < 3 && i > 0 && ((buf[i] as number) & 0xc0) === 0x80; k++) i--;
        const b = buf[i] as number;
        const need = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1;
        if (i >= 0 && i + need > buf.length) cut = i;
      }
      held = buf.slice(cut);
      const part = buf.subarray(0, cut);
      if (!isUtf8(part)) throw new TypeError('invalid UTF-8');
      return Buffer.from(part.buffer, part.byteOffset, part.byteLength).toString('utf8');
    },
  };
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
