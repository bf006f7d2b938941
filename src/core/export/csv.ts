// CSV field quoting per RFC 4180: quote a field holding a comma, quote or line break, double the
// quotes inside. A field starting with = + - @ is prefixed with a quote mark so a spreadsheet does
// not run it as a formula (common practice against CSV injection).

export function csvField(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  let text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : value;
  if (typeof value === 'string' && /^[=+\-@]/.test(text) && !/^[-+]?\d/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export function csvLine(fields: (string | number | null | undefined)[]): string {
  return fields.map(csvField).join(',');
}
