import { fieldErrors, materialInputSchema, type ApiError } from '@tareline/protocol';
import { CsvError, parse } from 'csv-parse/sync';
import { stringify } from 'csv-stringify/sync';
import type { z } from 'zod';

/** A material as the library file holds it: the form's fields, its id and whether it is in use. */
export interface LibraryEntry {
  id?: string;
  active: boolean;
  input: z.output<typeof materialInputSchema>;
}

const PARTS = ['a', 'b', 'c'] as const;
const perPart = (prefix: string) => PARTS.map((p) => `${prefix}_${p}`);

/** The file's columns, in order. Lists are one column per part; cautions one per line of a cell. */
export const LIBRARY_COLUMNS = [
  'id',
  'name',
  'active',
  'ratio_basis',
  ...perPart('ratio'),
  'also_stated_basis',
  ...perPart('also_stated'),
  'specific_gravity',
  'yield_in3_per_lb',
  ...perPart('sg'),
  ...perPart('label'),
  'tolerance_pct',
  'pot_life_min',
  'pot_life_mass_g',
  'demold_min',
  'agitate_min',
  'open_shelf_life_days',
  ...perPart('cost_per_kg'),
  ...perPart('low_stock_g'),
  'storage_note',
  'sds_ref',
  'cautions',
] as const;

const REQUIRED = ['name', 'ratio_basis', 'ratio_a', 'ratio_b'];

/**
 * A spreadsheet runs a cell that starts with = + - @ (or tab, CR) as a formula (OWASP, "CSV
 * Injection"): such cells are written with a leading apostrophe. A cell that starts with an
 * apostrophe already gets one too, so reading strips exactly one and the round trip is exact.
 */
const FORMULA_START = /^[=+\-@\t\r']/;
export const guardCell = (cell: string): string => (FORMULA_START.test(cell) ? `'${cell}` : cell);
export const unguardCell = (cell: string): string => (cell.startsWith("'") ? cell.slice(1) : cell);

const num = (n: number | undefined): string => (n === undefined ? '' : String(n));
const spread = (list: readonly (string | number)[] | undefined, prefix: string) =>
  Object.fromEntries(perPart(prefix).map((col, i) => [col, list?.[i] ?? '']));

function toCells(e: LibraryEntry): Record<string, string> {
  const m = e.input;
  const cells: Record<string, string | number> = {
    id: e.id ?? '',
    name: m.name,
    active: String(e.active),
    ratio_basis: m.ratio.basis,
    ...spread(m.ratio.parts, 'ratio'),
    also_stated_basis: m.alsoStatedRatio?.basis ?? '',
    ...spread(m.alsoStatedRatio?.parts, 'also_stated'),
    specific_gravity: num(m.specificGravity),
    yield_in3_per_lb: num(m.yieldIn3PerLb),
    ...spread(m.partSpecificGravities, 'sg'),
    ...spread(m.partLabels, 'label'),
    tolerance_pct: num(m.tolerancePct),
    pot_life_min: num(m.potLifeMin),
    pot_life_mass_g: num(m.potLifeMassG),
    demold_min: num(m.demoldMin),
    agitate_min: num(m.agitateMin),
    open_shelf_life_days: num(m.openShelfLifeDays),
    ...spread(m.costPerKg, 'cost_per_kg'),
    ...spread(m.lowStockG, 'low_stock_g'),
    storage_note: m.storageNote ?? '',
    sds_ref: m.sdsRef ?? '',
    cautions: m.cautions.join('\n'),
  };
  return Object.fromEntries(Object.entries(cells).map(([k, v]) => [k, guardCell(String(v))]));
}

/** The library as CSV text, one material per row, header first. */
export function libraryToCsv(entries: readonly LibraryEntry[]): string {
  return stringify(entries.map(toCells), {
    header: true,
    columns: [...LIBRARY_COLUMNS],
    record_delimiter: 'windows',
  });
}

/** A number cell: a number when it reads as one, else the text, so the schema names the field. */
function numberCell(cell: string | undefined): number | string | undefined {
  if (cell === undefined || cell.trim() === '') return undefined;
  const n = Number(cell);
  return Number.isFinite(n) ? n : cell;
}

function listCells<T>(
  row: Record<string, string>,
  prefix: string,
  read: (c: string | undefined) => T | undefined,
): T[] | undefined {
  const values = perPart(prefix).map((col) => read(row[col]));
  while (values.length && values.at(-1) === undefined) values.pop();
  return values.length ? (values as T[]) : undefined;
}

const textCell = (c: string | undefined) => (c === undefined || c === '' ? undefined : c);

/** The object the material form would send, from one row of the file. */
function rowToInput(row: Record<string, string>): Record<string, unknown> {
  const also = textCell(row.also_stated_basis);
  const input: Record<string, unknown> = {
    name: row.name ?? '',
    ratio: { basis: row.ratio_basis, parts: listCells(row, 'ratio', numberCell) ?? [] },
    alsoStatedRatio: also
      ? { basis: also, parts: listCells(row, 'also_stated', numberCell) ?? [] }
      : undefined,
    specificGravity: numberCell(row.specific_gravity),
    yieldIn3PerLb: numberCell(row.yield_in3_per_lb),
    partSpecificGravities: listCells(row, 'sg', numberCell),
    partLabels: listCells(row, 'label', textCell),
    tolerancePct: numberCell(row.tolerance_pct),
    potLifeMin: numberCell(row.pot_life_min),
    potLifeMassG: numberCell(row.pot_life_mass_g),
    demoldMin: numberCell(row.demold_min),
    agitateMin: numberCell(row.agitate_min),
    openShelfLifeDays: numberCell(row.open_shelf_life_days),
    costPerKg: listCells(row, 'cost_per_kg', numberCell),
    lowStockG: listCells(row, 'low_stock_g', numberCell),
    storageNote: textCell(row.storage_note),
    sdsRef: textCell(row.sds_ref),
    cautions: (row.cautions ?? '').split(/\r?\n/).filter((line) => line !== ''),
  };
  return Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
}

export type LibraryParse =
  { ok: true; entries: LibraryEntry[] } | { ok: false; errors: ApiError['errors'] };

/**
 * Reads a library file. Every row is checked as the material form checks it; the errors name
 * the row as a spreadsheet numbers it (the header is row 1) and the column or field.
 */
export function parseLibraryCsv(csv: string): LibraryParse {
  let records: Record<string, string>[];
  try {
    records = parse(csv, { columns: true, bom: true, skip_empty_lines: true });
  } catch (err) {
    if (!(err instanceof CsvError)) throw err;
    const line = (err as CsvError & { lines?: number }).lines;
    return {
      ok: false,
      errors: [
        { path: line ? `row ${line}` : 'file', message: `Not a readable CSV file: ${err.message}` },
      ],
    };
  }
  const header = records.length ? Object.keys(records[0]!) : [];
  const errors: ApiError['errors'] = [];
  const known = new Set<string>(LIBRARY_COLUMNS);
  for (const col of header) {
    if (!known.has(col)) errors.push({ path: 'header', message: `Unknown column "${col}"` });
  }
  for (const col of REQUIRED) {
    if (records.length && !header.includes(col)) {
      errors.push({ path: 'header', message: `The column "${col}" is missing` });
    }
  }
  if (!records.length) errors.push({ path: 'file', message: 'The file has no materials' });
  if (errors.length) return { ok: false, errors };

  const entries: LibraryEntry[] = [];
  const seenIds = new Map<string, number>();
  records.forEach((raw, i) => {
    const rowNo = i + 2;
    const row = Object.fromEntries(Object.entries(raw).map(([k, v]) => [k, unguardCell(v)]));
    const id = textCell(row.id);
    if (id !== undefined) {
      const first = seenIds.get(id);
      if (first !== undefined) {
        errors.push({
          path: `row ${rowNo}.id`,
          message: `Row ${rowNo}: the same id as row ${first}`,
        });
      } else seenIds.set(id, rowNo);
      if (id.length > 100) {
        errors.push({
          path: `row ${rowNo}.id`,
          message: `Row ${rowNo}: no material has an id that long`,
        });
      }
    }
    const active = row.active ?? '';
    if (!['', 'true', 'false'].includes(active)) {
      errors.push({
        path: `row ${rowNo}.active`,
        message: `Row ${rowNo}: active must be true or false`,
      });
    }
    const parsed = materialInputSchema.safeParse(rowToInput(row));
    if (!parsed.success) {
      for (const e of fieldErrors(parsed.error)) {
        errors.push({ path: `row ${rowNo}.${e.path}`, message: `Row ${rowNo}: ${e.message}` });
      }
      return;
    }
    entries.push({
      ...(id !== undefined && { id }),
      active: active !== 'false',
      input: parsed.data,
    });
  });
  return errors.length ? { ok: false, errors } : { ok: true, entries };
}
