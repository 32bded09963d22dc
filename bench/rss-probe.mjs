// Loaded with `--import` into a timed child when /usr/bin/time is absent: on exit it writes the
// process's peak resident set size (kilobytes, from getrusage) to the file the harness named.
import { writeFileSync } from 'node:fs';

const target = process.env.CODEWEIR_BENCH_RSS_FILE;
if (target) process.on('exit', () => writeFileSync(target, String(process.resourceUsage().maxRSS)));
