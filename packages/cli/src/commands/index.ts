import type { CommandDef } from '../io.ts';
import { lintCommand } from './lint.ts';
import { checkCommand } from './check.ts';
import { describeCommand } from './describe.ts';
import { reportCommand } from './report.ts';
import { draftCommand } from './draft.ts';
import { compareCommand } from './compare.ts';
import { historyCommand } from './history.ts';
import { importCommand } from './import.ts';
import { exportCommand } from './export.ts';
import { sqlCommand } from './sql.ts';

export const commands: CommandDef[] = [lintCommand, checkCommand, describeCommand, reportCommand, draftCommand, compareCommand, historyCommand, importCommand, exportCommand, sqlCommand];
