// Streaming reader for delimited text (CSV, TSV, semicolon): takes text chunks, yields records as
// arrays of fields. Handles a BOM, CRLF, comment lines (# or //), quoted fields with doubled
// quotes and quoted line breaks. Pure: the Node side feeds it chunks read from disk.

export type Delimiter = ',' | '\t' | ';';

/** Picks the delimiter that splits the header line into the most fields. */
export function detectDelimiter(headerLine: string): Delimiter {
  let best: Delimiter = ',';
  let bestCount = 0;
  for (const d of [',', '\t', ';'] as const) {
    const count = headerLine.split(d).length;
    if (count > bestCount) { best = d; bestCount = count; }
  }
  return best;
}

export interface LineRecord {
  /** 1-based line number where the record starts. */
  line: number;
  fields: string[];
}

function isComment(line: string): boolean {
  const t = line.trimStart();
  return t.startsWith('#') || t.startsWith('//');
}

function splitQuoted(text: string, delimiter: string): string[] {
  const fields: string[] = [];
  let i = 0;
  const n = text.length;
  while (i <= n) {
    if (text[i] === '"') {
      let value = '';
      i++;
      while (i < n) {
        const c = text[i];
        if (c === '"') {
          if (text[i + 1] === '"') { value += '"'; i += 2; continue; }
          i++;
          break;
        }
        value += c;
        i++;
      }
      // Skip anything between the closing quote and the delimiter.
      const next = text.indexOf(delimiter, i);
      fields.push(value + (next === -1 ? text.slice(i) : text.slice(i, next)).trim());
      if (next === -1) break;
      i = next + 1;
    } else {
      const next = text.indexOf(delimiter, i);
      if (next === -1) { fields.push(text.slice(i)); break; }
      fields.push(text.slice(i, next));
      i = next + 1;
    }
  }
  return fields;
}

function quotesOpen(text: string): boolean {
  let count = 0;
  for (let i = text.indexOf('"'); i !== -1; i = text.indexOf('"', i + 1)) count++;
  return count % 2 === 1;
}

/**
 * Incremental reader. push() text chunks as they arrive, then end(); each returns the complete
 * records found so far. The delimiter is detected from the first non-comment line unless given.
 */
export class DelimitedReader {
  private rest = '';
  private lineNumber = 0;
  private pending: { start: number; text: string } | undefined;
  private first = true;
  delimiter: Delimiter | undefined;

  constructor(delimiter?: Delimiter) {
    this.delimiter = delimiter;
  }

  push(chunk: string): LineRecord[] {
    let text = this.rest + chunk;
    if (this.first && text.length > 0) {
      if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
      this.first = false;
    }
    const lastBreak = text.lastIndexOf('\n');
    if (lastBreak === -1) { this.rest = text; return []; }
    this.rest = text.slice(lastBreak + 1);
    return this.lines(text.slice(0, lastBreak));
  }

  end(): LineRecord[] {
    const text = this.rest;
    this.rest = '';
    const out = text.length > 0 ? this.lines(text) : [];
    if (this.pending) {
      // An unterminated quote: hand the record over as it is; the caller validates field counts.
      out.push(this.toRecord(this.pending.start, this.pending.text));
      this.pending = undefined;
    }
    return out;
  }

  private lines(block: string): LineRecord[] {
    const out: LineRecord[] = [];
    let start = 0;
    const n = block.length;
    while (start <= n) {
      let end = block.indexOf('\n', start);
      if (end === -1) end = n;
      let line = block.slice(start, end);
      start = end + 1;
      this.lineNumber++;
      if (line.endsWith('\r')) line = line.slice(0, -1);
      if (this.pending) {
        this.pending.text += '\n' + line;
        if (!quotesOpen(this.pending.text)) {
          out.push(this.toRecord(this.pending.start, this.pending.text));
          this.pending = undefined;
        }
        if (end === n) break;
        continue;
      }
      if (line.trim() === '' || isComment(line)) { if (end === n) break; continue; }
      if (this.delimiter === undefined) this.delimiter = detectDelimiter(line);
      if (line.includes('"') && quotesOpen(line)) {
        this.pending = { start: this.lineNumber, text: line };
      } else {
        out.push(this.toRecord(this.lineNumber, line));
      }
      if (end === n) break;
    }
    return out;
  }

  private toRecord(line: number, text: string): LineRecord {
    const d = this.delimiter ?? ',';
    const fields = text.includes('"') ? splitQuoted(text, d) : text.split(d);
    return { line, fields };
  }
}
