import Papa from 'papaparse';
import type { ValveRecord } from './valve.repository';

/** Columns of the valve CSV, in export order. */
export const VALVE_CSV_COLUMNS = [
  'label',
  'type',
  'maker',
  'date_code',
  'origin_kind',
  'origin',
  'location',
  'status',
  'notes',
  'created_at',
  'updated_at',
] as const;

/** Columns an import reads; the rest (times) are the record's own and ignored. */
export const VALVE_IMPORT_COLUMNS = VALVE_CSV_COLUMNS.slice(0, 9);

/** One column an import reads. */
export type ValveImportColumn = (typeof VALVE_IMPORT_COLUMNS)[number];

const FORMULA_START = /^[=+\-@\t\r]/;

// Papa's own escapeFormulae misses cells that span lines, so the guard is done here.
function guardFormula(cell: string): string {
  return FORMULA_START.test(cell) ? `'${cell}` : cell;
}

/**
 * The valve list as CSV. Cells that a spreadsheet would run as a formula (starting with =, +,
 * -, @, tab or CR) get a leading apostrophe; the import takes it off again.
 */
export function valvesCsv(rows: readonly ValveRecord[]): string {
  const data = rows.map((r) =>
    [
      r.label,
      r.type_designation,
      r.maker ?? '',
      r.date_code ?? '',
      r.origin_kind ?? '',
      r.origin_text ?? '',
      r.location ?? '',
      r.status,
      r.notes ?? '',
      r.created_at,
      r.updated_at,
    ].map(guardFormula),
  );
  return Papa.unparse({ fields: [...VALVE_CSV_COLUMNS], data }, { newline: '\n' }) + '\n';
}

/** A data row of an import file with its 1-based line number. */
export interface ValveCsvRow {
  line: number;
  values: Partial<Record<ValveImportColumn, string>>;
  /** Why the row cannot be read (wrong number of cells), or null. */
  problem: string | null;
}

/** An import file read into rows, or why it cannot be read at all. */
export type ValveCsvFile =
  | { ok: true; rows: ValveCsvRow[]; ignoredColumns: string[] }
  | { ok: false; line: number; reason: string };

function unescapeFormula(cell: string): string {
  return /^'[=+\-@\t\r]/.test(cell) ? cell.slice(1) : cell;
}

/**
 * Reads a valve CSV: a header naming columns (any case and order; `type` is required), then one
 * valve a row. Lines starting with `#` and blank lines are skipped. Quoted cells may span lines;
 * each row keeps the line it starts on.
 */
export function parseValveCsv(input: string): ValveCsvFile {
  if (input.includes('\u0000'))
    return { ok: false, line: 1, reason: 'not a CSV file: binary data' };
  const text = input.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  const raw: { line: number; cells: string[] }[] = [];
  let newlines = 0;
  let counted = 0;
  Papa.parse<string[]>(text, {
    comments: '#',
    skipEmptyLines: 'greedy',
    step: (result) => {
      const end = result.meta.cursor;
      for (let i = counted; i < end; i++) if (text.charCodeAt(i) === 10) newlines++;
      counted = end;
      const inside = result.data.reduce((n, c) => n + (c.match(/\n/g)?.length ?? 0), 0);
      const trailing = text.charCodeAt(end - 1) === 10 ? 1 : 0;
      raw.push({ line: 1 + newlines - trailing - inside, cells: result.data });
    },
  });
  if (raw.length === 0) return { ok: false, line: 1, reason: 'the file is empty' };
  const [header, ...body] = raw;
  const names = header.cells.map((c) => c.trim().toLowerCase().replace(/\s+/g, '_'));
  if (!names.includes('type')) {
    return {
      ok: false,
      line: header.line,
      reason: `the header must name a "type" column (columns: ${VALVE_CSV_COLUMNS.join(', ')})`,
    };
  }
  const known = new Set<string>(VALVE_IMPORT_COLUMNS);
  const repeated = names.find((n, i) => known.has(n) && names.indexOf(n) !== i);
  if (repeated) return { ok: false, line: header.line, reason: `column ${repeated} appears twice` };
  const ignoredColumns = names.filter(
    (n) => !known.has(n) && !(VALVE_CSV_COLUMNS as readonly string[]).includes(n),
  );
  const rows = body.map(({ line, cells }): ValveCsvRow => {
    const values: ValveCsvRow['values'] = {};
    names.forEach((n, i) => {
      if (known.has(n) && cells[i] !== undefined) {
        values[n as ValveImportColumn] = unescapeFormula(cells[i].trim());
      }
    });
    const problem =
      cells.length === names.length
        ? null
        : `expected ${names.length} columns, found ${cells.length}`;
    return { line, values, problem };
  });
  return {
    ok: true,
    rows,
    ignoredColumns,
  };
}
