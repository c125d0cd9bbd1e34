/**
 * Small CSV tables for exports (transfer points, readings): RFC 4180 quoting (fields with a comma, quote or line
 * break are quoted, quotes doubled), a header row, "\n" line ends. Numbers as JavaScript prints them, which
 * round-trips every double exactly.
 */
export type CsvCell = string | number | boolean | null;

export function csvField(value: CsvCell): string {
  if (value === null) return '';
  const text = typeof value === 'boolean' ? (value ? 'yes' : 'no') : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function formatCsvTable(header: readonly string[], rows: ReadonlyArray<readonly CsvCell[]>): string {
  return [header, ...rows].map((row) => row.map(csvField).join(',')).join('\n') + '\n';
}
