/** The in-memory wrapper around the tokenizer: the same Delivery over a string. */
import { BatchStream } from './tokenizer.ts';
import { parseHeader, tokenizerFor, type HeaderSettings } from './header.ts';
import { detectDelimiter, detectNewline, looksBinary } from './detect.ts';
import { defaultBatchRows, normalizeReadOptions } from './options.ts';
import { CodeweirError } from '@codeweir/core';
import type { Delivery, ReadOptions, RowBatch } from './types.ts';

const SAMPLE_CHARS = 64 * 1024;

async function* textBatches(text: string, from: number, firstLine: number, s: HeaderSettings, columns: number): AsyncGenerator<RowBatch> {
  const { blockSize } = s.options;
  const batchRows = s.options.batchRows ?? defaultBatchRows(columns);
  const tok = tokenizerFor(s, firstLine, true);
  const batches = new BatchStream(1, batchRows);
  for (let pos = from; ; ) {
    const next = Math.min(text.length, pos + blockSize);
    tok.push(text.slice(pos, next), next >= text.length);
    pos = next;
    if (yield* batches.drain(tok)) return;
  }
}

/**
 * The Delivery of CSV text already in memory (tests, the library API): same grammar, header,
 * delimiter detection and errors as {@link openDelivery}, a leading U+FEFF removed (`hadBom`).
 * `options.name` names the text in error messages; `options.blockSize` (characters) cuts it
 * into chunks as a file read would. `encoding` is reported as given (the text is decoded).
 * Cost: one pass per `batches()` call. Throws CW_FILE_EMPTY, CW_CSV_BINARY, CW_USAGE, and
 * while streaming CW_CSV_UNCLOSED_QUOTE, CW_CSV_FIELD_TOO_LARGE.
 */
export function readDeliveryText(text: string, options: ReadOptions = {}): Delivery {
  const opts = normalizeReadOptions(options);
  const file = options.name ?? '<text>';
  const hadBom = text.charCodeAt(0) === 0xfeff;
  const body = hadBom ? text.slice(1) : text;
  if (body.length === 0) throw new CodeweirError('CW_FILE_EMPTY', `The data file ${file} is empty (0 bytes).`, { file });
  const sample = body.slice(0, SAMPLE_CHARS);
  if (looksBinary(sample)) {
    throw new CodeweirError('CW_CSV_BINARY', `${file} is not text (its start is full of control characters).`, { file });
  }
  const newline = detectNewline(sample);
  const delimiter = opts.delimiter ?? detectDelimiter(sample, newline, sample.length === body.length);
  const settings: HeaderSettings = { file, delimiter, newline, options: opts };
  let head;
  for (let want = SAMPLE_CHARS; ; want *= 4) {
    head = parseHeader(body.slice(0, want), want >= body.length, settings);
    if (head) break;
  }
  const { consumed, nextLine } = head;
  return {
    file,
    header: head.header,
    delimiter,
    encoding: opts.encoding ?? 'utf-8',
    hadBom,
    newline,
    firstDataLine: nextLine,
    batches: () => textBatches(body, consumed, nextLine, settings, head.header.length),
  };
}
