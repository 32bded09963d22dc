import type { CommandDef } from '../io.ts';
import { lintCommand } from './lint.ts';
import { checkCommand } from './check.ts';
import { describeCommand } from './describe.ts';
import { reportCommand } from './report.ts';
import { draftCommand } from './draft.ts';

export const commands: CommandDef[] = [lintCommand, checkCommand, describeCommand, reportCommand, draftCommand];
