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
  /** Set when the input ended inside a quoted field: the file was probably cut short. */
  unterminated?: boolean;
}

/** True for a blank line or a comment (# or //), checked without allocating a trimmed copy. */
function isSkippable(line: string): boolean {
  let i = 0;
  const n = line.length;
  while (i < n) {
    const c = line.charCodeAt(i);
    if (c !== 32 && c !== 9 && c !== 13) break;
    i++;
  }
  if (i === n) return true;
  const c = line.charCodeAt(i);
  return c === 35 || (c === 47 && line.charCodeAt(i + 1) === 47);
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

/**
 * True when a quoted field is still open at the end of the text. Only a quote at the start of a
 * field opens quoting (RFC 4180); a quote inside an unquoted field is taken literally, as lenient
 * readers do, so one stray quote does not swallow the lines after it.
 */
function quotesOpen(text: string, delimiter: string): boolean {
  let inQuotes = false;
  let fieldStart = true;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (inQuotes) {
      if (c === '"') { if (text[i + 1] === '"') i++; else inQuotes = false; }
      continue;
    }
    if (c === '"' && fieldStart) { inQuotes = true; fieldStart = false; continue; }
    fieldStart = c === delimiter || c === '\n';
  }
  return inQuotes;
}

/**
 * Incremental reader. push() text chunks as they arrive, then end(); each returns the complete
 * records found so far. The delimiter is detected from the first non-comment line unless given.
 */
/** Longest record a quoted field may stretch over before the reader gives up on it. */
const MAX_QUOTED_CHARS = 16 << 20;

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
      out.push({ ...this.toRecord(this.pending.start, this.pending.text), unterminated: true });
      this.pending = undefined;
    }
    return out;
  }

  /** True while a quoted field spans lines: the next text must come through push/pushLines. */
  get inQuotedField(): boolean { return this.pending !== undefined; }

  /** Line number of the last line read. */
  get currentLine(): number { return this.lineNumber; }

  /**
   * Complete lines (no trailing line break) whose first line is firstLine, for a caller that cuts
   * the input at line breaks itself and reads some lines another way.
   */
  pushLines(text: string, firstLine: number): LineRecord[] {
    this.first = false;
    this.lineNumber = firstLine - 1;
    return this.lines(text);
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
      if (line.charCodeAt(line.length - 1) === 13) line = line.slice(0, -1);
      if (this.pending) {
        this.pending.text += '\n' + line;
        if (this.pending.text.length > MAX_QUOTED_CHARS) {
          throw new Error(`The quoted field that starts on line ${this.pending.start} is still open ${MAX_QUOTED_CHARS >> 20} Mi characters later; a closing quote is probably missing.`);
        }
        if (!quotesOpen(this.pending.text, this.delimiter ?? ',')) {
          out.push(this.toRecord(this.pending.start, this.pending.text));
          this.pending = undefined;
        }
        if (end === n) break;
        continue;
      }
      const c0 = line.charCodeAt(0);
      if ((c0 <= 32 || c0 === 35 || c0 === 47 || line.length === 0) && isSkippable(line)) { if (end === n) break; continue; }
      if (this.delimiter === undefined) this.delimiter = detectDelimiter(line);
      if (line.indexOf('"') !== -1 && quotesOpen(line, this.delimiter)) {
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
