/**
 * The main job on the bundled demo, end to end, with the installed `codeweir` binary (the built
 * CLI): lint the codebook, check the seeded demo delivery (findings log, missingness by field
 * team) and write the report. The demo delivery carries planted faults (examples/demo-faults.json),
 * so `check` and `report` rightly reject it (exit 1); this script treats that verdict as the
 * expected outcome and fails only when a step cannot run. The delivery itself is regenerated,
 * byte for byte, by `examples/make-demo.ts` (a test keeps the two in step).
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { resolve } from 'node:path';

const here = fileURLToPath(new URL('.', import.meta.url));
const bin = resolve(here, '../packages/cli/bin/codeweir.mjs');
const codebook = resolve(here, 'household.codebook.json');
const delivery = resolve(here, 'demo-delivery.csv');
const out = resolve(here, 'out');

function step(title, argv, expected) {
  process.stderr.write(`\n== ${title}\n`);
  const r = spawnSync(process.execPath, [bin, ...argv], { stdio: 'inherit' });
  const code = r.status ?? 2;
  if (!expected.includes(code)) {
    process.stderr.write(`demo: "codeweir ${argv[0]}" ended with exit ${code}, expected ${expected.join(' or ')}.\n`);
    process.exit(code === 0 ? 1 : code);
  }
}

step('codeweir lint', ['lint', codebook], [0]);
step('codeweir check (the demo has planted faults: exit 1 is the expected verdict)', ['check', delivery, '--codebook', codebook, '--out', resolve(out, 'check'), '--split-by', 'team'], [1]);
step('codeweir report', ['report', delivery, '--codebook', codebook, '-o', resolve(out, 'demo-report.html'), '--pairs', 'all', '--split-by', 'team'], [1]);
process.stderr.write(`\nThe demo report is ${resolve(out, 'demo-report.html')}, one page per field team in ${resolve(out, 'demo-report-team')}; the findings log and missingness by team are in ${resolve(out, 'check')}.\n`);
