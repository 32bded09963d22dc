/**
 * Cell suppression for tables of counts: every count from 1 to k - 1 is suppressed (primary
 * suppression), and further cells are suppressed (complementary suppression) until no
 * suppressed cell can be recomputed from what the table still shows, its row and column totals
 * included.
 *
 * Method: the table with its margins is read as one (rows + 1) x (columns + 1) array whose every
 * row and column sums to zero (cells, minus the row total in the last column, minus the column
 * totals in the last row, the grand total in the corner). The unknown cells are the edges of a
 * bipartite graph between its rows and columns. An unknown cell is determined by the others
 * exactly when its edge is a bridge of that graph (on no cycle); a cell on a cycle whose inner
 * cells are all at least 1 can move by 1 both ways, so its interval has width at least 2. While
 * a suppressed cell is a bridge, the cheapest chain of shown cells that closes a cycle through
 * it is suppressed too (Dijkstra; cost: the count itself for inner cells of at least k, so small
 * cells go first and little is lost; margins cost more than any inner cell; zeros are never used,
 * and a 0 is not suppressed: an empty cell describes nobody, common practice). Margins that are
 * published elsewhere ('fixed') are never suppressed; margins the table does not show
 * ('hidden') are unknown from the start.
 */

/** How a table shows a margin. */
export type MarginShown = 'shown' | 'fixed' | 'hidden';

export interface SuppressionMargins {
  /** Row totals (default 'shown'); one entry per row to set each. */
  rows?: MarginShown | readonly MarginShown[];
  /** Column totals (default 'shown'); one entry per column to set each. */
  columns?: MarginShown | readonly MarginShown[];
  /** The grand total (default: 'fixed' when both margins are fixed, else as the row totals). */
  grand?: MarginShown;
}

/** Cells already suppressed elsewhere (another table sharing them): suppressed here from the start. */
export interface SuppressionPreset {
  cells?: ReadonlyArray<ReadonlyArray<boolean>>;
  /** Inner cells to use as complements only after every other inner cell (their values may be known from elsewhere). */
  avoid?: ReadonlyArray<ReadonlyArray<boolean>>;
  rowTotals?: readonly boolean[];
  columnTotals?: readonly boolean[];
  grandTotal?: boolean;
}

/** 0 shown, 1 suppressed because below k, 2 suppressed to protect another cell. */
export type CellState = 0 | 1 | 2;

export interface Suppression {
  minCell: number;
  /** State of each inner cell, same shape as the table. */
  cells: CellState[][];
  /** State of each row total and column total, and of the grand total (hidden margins count as 2). */
  rowTotals: CellState[];
  columnTotals: CellState[];
  grandTotal: CellState;
  /** Cells suppressed (inner and margins): primary, complementary. */
  primary: number;
  complementary: number;
  /** False when no set of cells could protect every small cell (then every nonzero cell is suppressed). */
  protected: boolean;
}

/** Sums of a table: row totals, column totals, grand total. Cost: O(cells). */
export function tableTotals(table: readonly (readonly number[])[]): { rows: number[]; columns: number[]; grand: number } {
  const columns = new Array<number>(table[0]?.length ?? 0).fill(0);
  const rows = table.map((row) => {
    let s = 0;
    row.forEach((v, j) => {
      s += v;
      columns[j]! += v;
    });
    return s;
  });
  return { rows, columns, grand: rows.reduce((a, b) => a + b, 0) };
}

/** The bridges among the unknown cells of the extended table (indices into `edges`). Iterative Tarjan. */
function bridges(nodes: number, edges: ReadonlyArray<readonly [number, number]>): Set<number> {
  const adj: Array<Array<[number, number]>> = Array.from({ length: nodes }, () => []);
  edges.forEach(([a, b], e) => {
    adj[a]!.push([b, e]);
    adj[b]!.push([a, e]);
  });
  const disc = new Int32Array(nodes).fill(-1);
  const low = new Int32Array(nodes);
  const out = new Set<number>();
  let time = 0;
  for (let s = 0; s < nodes; s++) {
    if (disc[s] !== -1) continue;
    // Stack frames: node, edge it was entered by, next adjacency position.
    const stack: Array<[number, number, number]> = [[s, -1, 0]];
    disc[s] = low[s] = time++;
    while (stack.length > 0) {
      const frame = stack[stack.length - 1]!;
      const [v, via] = frame;
      if (frame[2] < adj[v]!.length) {
        const [w, e] = adj[v]![frame[2]++]!;
        if (e === via) continue;
        if (disc[w] === -1) {
          disc[w] = low[w] = time++;
          stack.push([w, e, 0]);
        } else low[v] = Math.min(low[v]!, disc[w]!);
      } else {
        stack.pop();
        if (stack.length > 0) {
          const parent = stack[stack.length - 1]![0];
          low[parent] = Math.min(low[parent]!, low[v]!);
          if (low[v]! > disc[parent]!) out.add(via);
        }
      }
    }
  }
  return out;
}

/**
 * Suppresses the cells of a table of counts so that no count from 1 to minCell - 1 is shown and
 * none of the suppressed cells can be recomputed from the rest (see the file comment).
 * Cost: O(S x C log C) for S suppressed cells and C cells (a Dijkstra per unprotected cell).
 * Throws nothing. minCell <= 1 suppresses nothing.
 * @example suppressCells([[3, 10], [12, 20]], 5).cells // [[1, 2], [2, 2]]
 */
export function suppressCells(table: readonly (readonly number[])[], minCell: number, margins: SuppressionMargins = {}, preset: SuppressionPreset = {}): Suppression {
  const m = table.length;
  const n = table[0]?.length ?? 0;
  const totals = tableTotals(table);
  const rowShown = (i: number): MarginShown => (typeof margins.rows === 'string' || margins.rows === undefined ? (margins.rows ?? 'shown') : margins.rows[i]!);
  const colShown = (j: number): MarginShown => (typeof margins.columns === 'string' || margins.columns === undefined ? (margins.columns ?? 'shown') : margins.columns[j]!);
  const every = (f: (k: number) => MarginShown, count: number, how: MarginShown): boolean => count > 0 && Array.from({ length: count }, (_, k) => f(k)).every((x) => x === how);
  const rowsShown = every(rowShown, m, 'fixed') ? 'fixed' : every(rowShown, m, 'hidden') ? 'hidden' : 'shown';
  const colsShown = every(colShown, n, 'fixed') ? 'fixed' : every(colShown, n, 'hidden') ? 'hidden' : 'shown';
  const grandShown = margins.grand ?? (rowsShown === 'fixed' && colsShown === 'fixed' ? 'fixed' : rowsShown === 'hidden' && colsShown === 'hidden' ? 'hidden' : rowsShown === 'hidden' ? colsShown : rowsShown);
  // The extended table: value and how it is shown, per cell (i in 0..m, j in 0..n).
  const W = n + 1;
  const value = (i: number, j: number): number => (i < m && j < n ? table[i]![j]! : i < m ? totals.rows[i]! : j < n ? totals.columns[j]! : totals.grand);
  const shownAs = (i: number, j: number): MarginShown => (i < m && j < n ? 'shown' : i < m ? rowShown(i) : j < n ? colShown(j) : grandShown);
  const presetAt = (i: number, j: number): boolean =>
    (i < m && j < n ? preset.cells?.[i]?.[j] : i < m ? preset.rowTotals?.[i] : j < n ? preset.columnTotals?.[j] : preset.grandTotal) === true;
  const state = new Uint8Array((m + 1) * W);
  let primary = 0;
  for (let i = 0; i <= m; i++) {
    for (let j = 0; j <= n; j++) {
      const how = shownAs(i, j);
      const v = value(i, j);
      if (how === 'hidden') state[i * W + j] = 2;
      else if (minCell > 1 && how === 'shown' && v >= 1 && v < minCell) {
        state[i * W + j] = 1;
        primary++;
      } else if (how === 'shown' && presetAt(i, j)) state[i * W + j] = 2;
    }
  }
  const result = (ok: boolean): Suppression => {
    const s = (i: number, j: number): CellState => state[i * W + j] as CellState;
    let complementary = 0;
    for (let i = 0; i <= m; i++) for (let j = 0; j <= n; j++) if (state[i * W + j] === 2 && shownAs(i, j) !== 'hidden') complementary++;
    return {
      minCell,
      cells: Array.from({ length: m }, (_, i) => Array.from({ length: n }, (_, j) => s(i, j))),
      rowTotals: Array.from({ length: m }, (_, i) => s(i, n)),
      columnTotals: Array.from({ length: n }, (_, j) => s(m, j)),
      grandTotal: s(m, n),
      primary,
      complementary,
      protected: ok,
    };
  };
  if (!state.some((x, c) => x !== 0 && shownAs(Math.floor(c / W), c % W) !== 'hidden') || m === 0 || n === 0) return result(true);

  // Nodes: rows 0..m, then columns m+1..m+1+n.
  const nodes = m + 1 + n + 1;
  const cost = (i: number, j: number): number => {
    const v = value(i, j);
    const how = shownAs(i, j);
    if (how === 'fixed' || v === 0) return Number.POSITIVE_INFINITY;
    // Inner cells by their count; margins after every inner cell.
    return i < m && j < n ? (preset.avoid?.[i]?.[j] ? 1e9 + v : v) : 1e12 + v;
  };
  for (;;) {
    const edges: Array<readonly [number, number]> = [];
    const cellOf: number[] = [];
    for (let i = 0; i <= m; i++) {
      for (let j = 0; j <= n; j++) {
        if (state[i * W + j] === 0) continue;
        edges.push([i, m + 1 + j]);
        cellOf.push(i * W + j);
      }
    }
    const loose = [...bridges(nodes, edges)].filter((e) => shownAs(Math.floor(cellOf[e]! / W), cellOf[e]! % W) !== 'hidden');
    if (loose.length === 0) return result(true);
    const e = loose[0]!;
    const cell = cellOf[e]!;
    const [from, to] = edges[e]!;
    // Dijkstra from the cell's row to its column, over unknown cells (free, the cell itself
    // excluded) and shown cells (their cost); the shown cells on the path are suppressed.
    const dist = new Float64Array(nodes).fill(Number.POSITIVE_INFINITY);
    const prevCell = new Int32Array(nodes).fill(-1);
    const prevNode = new Int32Array(nodes).fill(-1);
    const done = new Uint8Array(nodes);
    dist[from] = 0;
    for (;;) {
      let v = -1;
      for (let x = 0; x < nodes; x++) if (!done[x] && dist[x]! < Number.POSITIVE_INFINITY && (v === -1 || dist[x]! < dist[v]!)) v = x;
      if (v === -1 || v === to) break;
      done[v] = 1;
      const isRow = v <= m;
      const count = isRow ? n + 1 : m + 1;
      for (let k = 0; k < count; k++) {
        const i = isRow ? v : k;
        const j = isRow ? k : v - m - 1;
        const c = i * W + j;
        if (c === cell) continue;
        const w = state[c] !== 0 ? 0 : cost(i, j);
        const other = isRow ? m + 1 + j : i;
        if (dist[v]! + w < dist[other]!) {
          dist[other] = dist[v]! + w;
          prevCell[other] = c;
          prevNode[other] = v;
        }
      }
    }
    if (!(dist[to]! < Number.POSITIVE_INFINITY)) {
      // Nothing can protect this cell: suppress every nonzero cell that may be suppressed.
      for (let i = 0; i <= m; i++) for (let j = 0; j <= n; j++) if (state[i * W + j] === 0 && shownAs(i, j) === 'shown' && value(i, j) > 0) state[i * W + j] = 2;
      return result(false);
    }
    for (let v = to; v !== from; v = prevNode[v]!) if (state[prevCell[v]!] === 0) state[prevCell[v]!] = 2;
  }
}
