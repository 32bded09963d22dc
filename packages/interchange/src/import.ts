import { readFile, stat } from 'node:fs/promises';
import { basename, extname } from 'node:path';
import { CodeweirError } from '@codeweir/core';
import type { ReadOptions } from '@codeweir/read';
import { codebookFromVariableList, type ImportResult } from './variable-list.ts';
import { readVariableListCsv, readVariableListXlsx } from './workbook.ts';
import { codebookFromDdi } from './ddi-import.ts';

export type ImportFormat = 'xlsx' | 'csv' | 'ddi';

/**
 * The format of a file to import, from its extension: `.xlsx` a workbook, `.csv` (or `.txt`,
 * `.tsv`) a CSV variable list, `.xml` DDI-Codebook. Throws CodeweirError CW_USAGE naming the
 * extensions read when it is none of these.
 */
export function importFormatOf(path: string): ImportFormat {
  const ext = extname(path).toLowerCase();
  if (ext === '.xlsx') return 'xlsx';
  if (ext === '.csv' || ext === '.tsv' || ext === '.txt') return 'csv';
  if (ext === '.xml') return 'ddi';
  throw new CodeweirError('CW_USAGE', `codeweir import reads .xlsx and .csv variable lists and .xml DDI-Codebook files; ${basename(path)} is none of these.`, { file: path });
}

/**
 * Reads a codebook from a variable list (xlsx, CSV) or a DDI-Codebook XML file, as
 * {@link codebookFromVariableList} and {@link codebookFromDdi} describe. The file is only read.
 * Cost: the file in memory. Throws CodeweirError (exit 2) for a missing or unreadable file,
 * malformed XML (with line and column) or an unknown extension.
 */
export async function importCodebook(path: string, options: ReadOptions = {}): Promise<ImportResult> {
  const format = importFormatOf(path);
  try {
    if ((await stat(path)).isDirectory()) throw new CodeweirError('CW_FILE_IS_DIRECTORY', `${path} is a directory; name a file to import.`, { file: path });
  } catch (e) {
    if (e instanceof CodeweirError) throw e;
    throw new CodeweirError('CW_FILE_NOT_FOUND', `${path} does not exist; check the path.`, { file: path, cause: e });
  }
  const name = basename(path);
  if (format === 'xlsx') return codebookFromVariableList(await readVariableListXlsx(path), name);
  if (format === 'csv') return codebookFromVariableList(await readVariableListCsv(path, options), name);
  let xml: string;
  try {
    xml = await readFile(path, 'utf8');
  } catch (e) {
    throw new CodeweirError('CW_FILE_UNREADABLE', `${path} cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message}).`, { file: path, cause: e });
  }
  return codebookFromDdi(xml.charCodeAt(0) === 0xfeff ? xml.slice(1) : xml, name);
}
