/**
 * The input-format options shared by every command that reads a delivery (`--format`,
 * `--sheet`), and the one way those commands open a delivery that is not plain delimited text.
 */
import type { CompiledCodebook } from '@codeweir/codebook';
import type { CheckOptionsInput, CheckResult } from '@codeweir/check';
import type { Delivery } from '@codeweir/read';

/** `--format` as every reading command declares it. */
export const FORMAT_OPTION = {
  type: 'string',
  describe: 'input format: csv, csv.gz, xlsx or parquet (default: from the file name; .tsv and .txt are csv)',
} as const;

/** `--sheet` as every reading command declares it. */
export const SHEET_OPTION = { type: 'string', describe: 'xlsx: the worksheet to read (default: the first)' } as const;

/** The format and sheet of a command's arguments. */
export interface InputFormat {
  format?: string;
  sheet?: string;
}

/** `--format` / `--sheet` from yargs arguments (absent stays undefined). Cost: O(1). Throws nothing. */
export function inputFormatOf(args: Record<string, unknown>): InputFormat {
  return {
    format: args.format === undefined ? undefined : String(args.format),
    sheet: args.sheet === undefined ? undefined : String(args.sheet),
  };
}

/**
 * True when the delivery is read by the delimited-text reader unchanged (the built-in fast path,
 * threads and all): format csv by name or by `--format`, and no `--sheet`. Cost: O(1). Throws
 * CodeweirError CW_USAGE for an unknown `--format`.
 */
export async function isPlainText(path: string, input: InputFormat): Promise<boolean> {
  const { formatOf } = await import('@codeweir/read');
  return formatOf(path, input.format) === 'csv' && input.sheet === undefined;
}

/**
 * Checks a delivery in a typed or compressed format (csv.gz, xlsx, Parquet) on one thread,
 * through the same classification as CSV; the summary's `header.typeNotes` lists the columns
 * whose delivered type disagrees with the item's type. `wrap` may wrap the opened delivery
 * (progress). Cost: one pass. Throws what {@link openAnyDelivery} and checkDelivery throw.
 */
export async function checkTypedInput(
  path: string,
  codebook: CompiledCodebook,
  options: CheckOptionsInput & { delimiter?: string; encoding?: string; maxFieldBytes?: number },
  input: InputFormat,
  wrap: (d: Delivery) => Delivery = (d) => d,
): Promise<CheckResult> {
  const [{ openAnyDelivery, typeNotes }, { checkDelivery }] = await Promise.all([import('@codeweir/read'), import('@codeweir/check')]);
  const delivery = await openAnyDelivery(path, {
    format: input.format,
    sheet: input.sheet,
    delimiter: options.delimiter,
    encoding: options.encoding as never,
    maxFieldBytes: options.maxFieldBytes,
  });
  const result = await checkDelivery(wrap(delivery), codebook, options);
  const notes = typeNotes(delivery.columnTypes, codebook.items);
  if (notes.length > 0) result.summary.header.typeNotes = notes;
  return result;
}
