#!/usr/bin/env node
import { removePendingTemps } from '@codeweir/core';
import { run } from './cli.ts';

// An interrupted run must leave the previous outputs intact and no temporary files: outputs are
// only ever renamed into place, so removing the temporaries being written is enough.
let interrupted = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (interrupted) return;
    interrupted = true;
    process.stderr.write(`codeweir: interrupted (${signal}); no output was changed.\n`);
    void removePendingTemps().finally(() => process.exit(signal === 'SIGINT' ? 130 : 143));
  });
}

process.exitCode = await run(process.argv.slice(2));
