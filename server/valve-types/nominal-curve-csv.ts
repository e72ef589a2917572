/** One nominal curve: anode current against anode voltage at one grid voltage. V, mA. */
export interface NominalCurve {
  /** Grid-1 voltage of the curve, V. */
  vg1Volts: number;
  /** Points by ascending Va. */
  points: { vaVolts: number; iaMilliamps: number; ig2Milliamps: number | null }[];
}

/** Result of reading a nominal-curve file: curves by ascending Vg1, or the first problem. */
export type NominalCsvResult =
  | { ok: true; curves: NominalCurve[]; pointCount: number; hasScreenCurrent: boolean }
  | { ok: false; line: number; reason: string };

/** Most rows one file may carry. */
export const MAX_NOMINAL_ROWS = 50_000;

const COLUMNS = ['va', 'vg1', 'ia', 'ig2'] as const;

/**
 * Reads a digitised data-sheet family: a header `va,vg1,ia[,ig2]` (any case, spaces allowed)
 * in V, V, mA, mA, then one point a row. Blank lines and lines starting with `#` are skipped.
 * Points with equal Vg1 form one curve; each curve needs at least two points. Every problem is
 * reported with its 1-based line number, so the file can be fixed where it is wrong.
 */
export function parseNominalCurveCsv(text: string): NominalCsvResult {
  const fail = (line: number, reason: string): NominalCsvResult => ({ ok: false, line, reason });
  if (text.includes('\u0000')) return fail(1, 'not a CSV file: it holds binary data');
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);
  let columns: number | null = null;
  const curves = new Map<number, { firstLine: number; curve: NominalCurve }>();
  let rows = 0;
  for (let i = 0; i < lines.length; i++) {
    const lineNo = i + 1;
    const raw = lines[i].trim();
    if (raw === '' || raw.startsWith('#')) continue;
    const cells = raw.split(',').map((c) =>
      c
        .trim()
        .replace(/^"(.*)"$/, '$1')
        .trim(),
    );
    if (columns === null) {
      const names = cells.map((c) => c.toLowerCase().replace(/\s+/g, ''));
      const expected = names.length === 4 ? COLUMNS : COLUMNS.slice(0, 3);
      if (names.length < 3 || names.length > 4 || names.some((n, k) => n !== expected[k])) {
        return fail(
          lineNo,
          `not a nominal-curve CSV: the header must be "va,vg1,ia" or "va,vg1,ia,ig2" ` +
            `(V, V, mA, mA); found "${raw.slice(0, 60)}"`,
        );
      }
      columns = names.length;
      continue;
    }
    if (cells.length !== columns) {
      return fail(lineNo, `expected ${columns} columns, found ${cells.length}`);
    }
    const values: (number | null)[] = [];
    for (let k = 0; k < cells.length; k++) {
      const cell = cells[k];
      if (k === 3 && cell === '') {
        values.push(null);
        continue;
      }
      const n = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(cell) ? Number(cell) : NaN;
      if (!Number.isFinite(n)) {
        return fail(lineNo, `${COLUMNS[k]} "${cell.slice(0, 20)}" is not a number`);
      }
      values.push(n);
    }
    const [va, vg1, ia, ig2] = values as [number, number, number, number | null | undefined];
    if (va < 0) return fail(lineNo, `va ${va} V is negative`);
    if (ia < 0) return fail(lineNo, `ia ${ia} mA is negative`);
    if (ig2 != null && ig2 < 0) return fail(lineNo, `ig2 ${ig2} mA is negative`);
    if (++rows > MAX_NOMINAL_ROWS) return fail(lineNo, `more than ${MAX_NOMINAL_ROWS} points`);
    const key = vg1 === 0 ? 0 : vg1; // -0 and 0 are one curve
    let entry = curves.get(key);
    if (!entry) {
      entry = { firstLine: lineNo, curve: { vg1Volts: key, points: [] } };
      curves.set(key, entry);
    }
    entry.curve.points.push({ vaVolts: va, iaMilliamps: ia, ig2Milliamps: ig2 ?? null });
  }
  if (columns === null) return fail(1, 'not a nominal-curve CSV: no header line');
  if (curves.size === 0) return fail(lines.length, 'the file has a header but no points');
  for (const { firstLine, curve } of curves.values()) {
    if (curve.points.length < 2) {
      return fail(
        firstLine,
        `the curve at vg1 ${curve.vg1Volts} V has only 1 point; a curve needs at least 2`,
      );
    }
    curve.points.sort((a, b) => a.vaVolts - b.vaVolts);
  }
  const sorted = [...curves.values()].map((e) => e.curve).sort((a, b) => a.vg1Volts - b.vg1Volts);
  return {
    ok: true,
    curves: sorted,
    pointCount: rows,
    hasScreenCurrent: sorted.some((c) => c.points.some((p) => p.ig2Milliamps !== null)),
  };
}
