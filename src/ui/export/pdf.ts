// A small one-page PDF writer (PDF 1.4, ISO 32000-1 structure: header, numbered objects, xref
// table with 10-digit offsets, trailer). Text uses the standard Helvetica fonts with WinAnsi
// encoding, so no font is embedded; pictures are RGB image XObjects whose samples are zlib data
// (/FlateDecode). Pure: the caller compresses the pixels (see deflateRgb in reportPdf.ts).

export interface PdfImage {
  /** Resource name used in the content stream, e.g. "Im1". */
  name: string;
  width: number;
  height: number;
  /** zlib (RFC 1950) stream of width * height * 3 bytes, rows top to bottom. */
  deflated: Uint8Array;
}

/** Characters outside WinAnsi get a plain stand-in, so every text stays readable. */
const STAND_INS: Record<string, string> = {
  '—': '-', '–': '-', '−': '-', '≤': '<=', '≥': '>=', 'σ': 'sigma', 'ρ': 'rho', 'Δ': 'delta', '→': '->',
  '↑': '^', '↓': 'v', '…': '...', '’': "'", '‘': "'", '“': '"', '”': '"', '×': 'x', '·': '-', 'µ': 'u', '±': '+/-',
};

/** Text as WinAnsi bytes (Latin-1 range kept, others replaced), escaped for a PDF string. */
export function pdfString(text: string): string {
  let out = '';
  for (const ch of text) {
    const mapped = STAND_INS[ch] ?? ch;
    for (const c of mapped) {
      const code = c.charCodeAt(0);
      if (c === '(' || c === ')' || c === '\\') out += `\\${c}`;
      else if (code >= 32 && code < 127) out += c;
      else if (code >= 160 && code <= 255) out += `\\${code.toString(8).padStart(3, '0')}`;
      else out += '?';
    }
  }
  return `(${out})`;
}

const num = (v: number) => (Math.round(v * 100) / 100).toString();

/** Builds a content stream in page coordinates with the origin at the top-left (y down). */
export class PdfPage {
  readonly ops: string[] = [];
  readonly images: PdfImage[] = [];
  constructor(readonly width: number, readonly height: number) {}

  private y(top: number): number { return this.height - top; }

  /** Text with its baseline at (x, top). */
  text(x: number, top: number, size: number, text: string, bold = false, grey = 0): this {
    this.ops.push(`BT /${bold ? 'F2' : 'F1'} ${num(size)} Tf ${num(grey)} g ${num(x)} ${num(this.y(top))} Td ${pdfString(text)} Tj ET`);
    return this;
  }

  rect(x: number, top: number, w: number, h: number, fill: [number, number, number] | null, stroke: [number, number, number] | null = null): this {
    const parts = [`${num(x)} ${num(this.y(top + h))} ${num(w)} ${num(h)} re`];
    if (fill) parts.unshift(`${fill.map(num).join(' ')} rg`);
    if (stroke) parts.unshift(`${stroke.map(num).join(' ')} RG 0.6 w`);
    parts.push(fill && stroke ? 'B' : fill ? 'f' : 'S');
    this.ops.push(`q ${parts.join(' ')} Q`);
    return this;
  }

  line(x0: number, top0: number, x1: number, top1: number, grey = 0.6): this {
    this.ops.push(`q ${num(grey)} G 0.5 w ${num(x0)} ${num(this.y(top0))} m ${num(x1)} ${num(this.y(top1))} l S Q`);
    return this;
  }

  image(image: PdfImage, x: number, top: number, w: number, h: number): this {
    if (!this.images.some((i) => i.name === image.name)) this.images.push(image);
    this.ops.push(`q ${num(w)} 0 0 ${num(h)} ${num(x)} ${num(this.y(top + h))} cm /${image.name} Do Q`);
    return this;
  }
}

function latin1Bytes(text: string): Uint8Array {
  const bytes = new Uint8Array(text.length);
  for (let i = 0; i < text.length; i++) bytes[i] = text.charCodeAt(i) & 0xff;
  return bytes;
}

/** The finished file. Object 1 catalog, 2 pages, 3 page, 4-5 fonts, 6 content, 7.. images. */
export function writePdf(page: PdfPage, info: { title: string; creator: string }): Uint8Array {
  const parts: Uint8Array[] = [];
  const offsets: number[] = [];
  let length = 0;
  const push = (chunk: Uint8Array | string) => {
    const bytes = typeof chunk === 'string' ? latin1Bytes(chunk) : chunk;
    parts.push(bytes);
    length += bytes.byteLength;
  };
  const object = (id: number, body: string | (() => void)) => {
    offsets[id] = length;
    push(`${id} 0 obj\n`);
    if (typeof body === 'string') push(body); else body();
    push('\nendobj\n');
  };
  // A binary comment line after the header tells tools the file holds binary data.
  push('%PDF-1.4\n%\xe2\xe3\xcf\xd3\n');
  const imageIds = page.images.map((_, k) => 8 + k);
  const xobjects = page.images.map((img, k) => `/${img.name} ${imageIds[k]} 0 R`).join(' ');
  const content = page.ops.join('\n');
  object(1, '<< /Type /Catalog /Pages 2 0 R >>');
  object(2, '<< /Type /Pages /Kids [3 0 R] /Count 1 >>');
  object(3, `<< /Type /Page /Parent 2 0 R /MediaBox [0 0 ${num(page.width)} ${num(page.height)}] /Contents 6 0 R ` +
    `/Resources << /Font << /F1 4 0 R /F2 5 0 R >> /XObject << ${xobjects} >> >> >>`);
  object(4, '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica /Encoding /WinAnsiEncoding >>');
  object(5, '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica-Bold /Encoding /WinAnsiEncoding >>');
  object(6, `<< /Length ${latin1Bytes(content).byteLength} >>\nstream\n${content}\nendstream`);
  object(7, `<< /Title ${pdfString(info.title)} /Creator ${pdfString(info.creator)} /Producer ${pdfString(info.creator)} >>`);
  page.images.forEach((img, k) => object(imageIds[k], () => {
    push(`<< /Type /XObject /Subtype /Image /Width ${img.width} /Height ${img.height} /ColorSpace /DeviceRGB ` +
      `/BitsPerComponent 8 /Filter /FlateDecode /Length ${img.deflated.byteLength} >>\nstream\n`);
    push(img.deflated);
    push('\nendstream');
  }));
  const count = 8 + page.images.length;
  const xrefAt = length;
  let xref = `xref\n0 ${count}\n0000000000 65535 f \n`;
  for (let id = 1; id < count; id++) xref += `${String(offsets[id]).padStart(10, '0')} 00000 n \n`;
  push(xref);
  push(`trailer\n<< /Size ${count} /Root 1 0 R /Info 7 0 R >>\nstartxref\n${xrefAt}\n%%EOF\n`);
  const out = new Uint8Array(length);
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.byteLength; }
  return out;
}
