import type { Io } from './io.ts';

/** A progress line on stderr: `update(done)` redraws it, `done()` clears it. */
export interface Progress {
  update(done: number): void;
  /** Names the current phase (redraws at once). */
  phase(label: string): void;
  done(): void;
}

const WIDTH = 24;
/** Redraws at most this often, so a fast loop does not flood the terminal. */
const MIN_INTERVAL_MS = 100;

/**
 * A progress indicator on stderr for a terminal: a bar with a percentage when `total` is
 * known, otherwise the phase label and the count so far. Prints nothing at all when stderr is
 * not a TTY (`io.isTTY` false) or when `quiet` is set, so logs and pipes stay clean.
 * Cost: one short write per redraw, at most every 100 ms. Throws nothing.
 * @example const p = createProgress(io, { total: 40, label: 'charts' }); p.update(10); p.done();
 */
export function createProgress(io: Io, options: { total?: number; label: string; quiet?: boolean }): Progress {
  if (!io.isTTY || options.quiet) return { update() {}, phase() {}, done() {} };
  let label = options.label;
  let last = 0;
  let drawn = false;
  const draw = (done: number) => {
    const total = options.total;
    let text: string;
    if (total !== undefined && total > 0) {
      const share = Math.min(1, Math.max(0, done / total));
      const full = Math.round(share * WIDTH);
      text = `${label} [${'#'.repeat(full)}${'-'.repeat(WIDTH - full)}] ${Math.round(share * 100)}%`;
    } else text = done > 0 ? `${label}: ${done.toLocaleString('en')}` : `${label}...`;
    io.stderr(`\r\u001b[K${text}`);
    drawn = true;
  };
  return {
    update(done) {
      const now = Date.now();
      if (now - last < MIN_INTERVAL_MS) return;
      last = now;
      draw(done);
    },
    phase(next) {
      label = next;
      last = Date.now();
      draw(0);
    },
    done() {
      if (drawn) io.stderr('\r\u001b[K');
      drawn = false;
    },
  };
}
