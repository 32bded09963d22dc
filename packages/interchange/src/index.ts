/**
 * @codeweir/interchange: codebooks from where they already live and back. A spreadsheet
 * variable list (xlsx or CSV, one row an item) and DDI-Codebook 2.5 XML are read into a
 * codebook, every guess marked for a person to confirm; a codebook is written as either, and
 * importing what was exported gives back the same codebook.
 */
export { codebookFromVariableList, variableListFromCodebook, type VariableList, type ImportResult } from './variable-list.ts';
export { readVariableListXlsx, readVariableListCsv, variableListXlsx, SHEETS } from './workbook.ts';
export { ddiFromCodebook, NOTE, BIN_TEXT, type DeliveryStatistics } from './ddi-export.ts';
export { codebookFromDdi } from './ddi-import.ts';
export { kindFromLabel, type ImportGuess } from './guess.ts';
export { parseListCell, formatEntry, parseBounds, formatBounds, type CellEntry } from './cells.ts';
export { importCodebook, importFormatOf, type ImportFormat } from './import.ts';
