import zlib from 'node:zlib';

/**
 * Which issued sheet a PDF says it is, read from its metadata: the document Title, the one
 * metadata field Chromium writes (from the sheet's <title>, which on an issued print ends
 * "— issued sheet N, fingerprint XXXXXXXXXXXX"; calc-sheets/view/title-block.ts). An altered file
 * usually keeps it: an editor that saves incrementally appends a new Info dictionary (the last
 * one wins), one that rewrites may move it into a compressed object stream or into XMP
 * (dc:title), so those are read too. Nothing here trusts the claim: it only names the sheet the
 * file claims to be, which the verify answer then compares with the archive.
 *
 * Strings per ISO 32000-1 §7.3.4 (literal strings with escapes and balanced parentheses, hex
 * strings; UTF-16BE with a byte order mark, else PDFDocEncoding, read here as Latin-1).
 */

export interface PdfClaim {
  sheetId: number;
  fingerprint: string;
  title: string;
}

const CLAIM = /issued sheet (\d{1,12}), fingerprint ([0-9a-f]{12})/;
/** Inflated streams read at most, and bytes out of each: a hostile file cannot make this large. */
const MAX_STREAMS = 400;
const MAX_INFLATED = 2 * 1024 * 1024;
const MAX_TOTAL_INFLATED = 16 * 1024 * 1024;

function decodePdfString(bytes: Buffer): string {
  if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    const body = bytes.subarray(2);
    const swapped = Buffer.alloc(body.length - (body.length % 2));
    for (let i = 0; i + 1 < body.length; i += 2) {
      swapped[i] = body[i + 1];
      swapped[i + 1] = body[i];
    }
    return swapped.toString('utf16le');
  }
  return bytes.toString('latin1');
}

/** A literal string starting at `at` (just after "("): its bytes, escapes resolved. */
function literalAt(text: string, at: number): Buffer {
  const out: number[] = [];
  let depth = 1;
  for (let i = at; i < text.length && out.length < 4096; i++) {
    const c = text.charCodeAt(i);
    if (c === 0x5c) {
      const n = text[i + 1];
      const simple: Record<string, number> = { n: 10, r: 13, t: 9, b: 8, f: 12, '(': 40, ')': 41, '\\': 92 };
      if (n in simple) {
        out.push(simple[n]);
        i++;
      } else if (/[0-7]/.test(n ?? '')) {
        const m = /^[0-7]{1,3}/.exec(text.slice(i + 1, i + 4))![0];
        out.push(parseInt(m, 8) & 0xff);
        i += m.length;
      } else if (n === '\r' || n === '\n') {
        i += n === '\r' && text[i + 2] === '\n' ? 2 : 1;
      }
      continue;
    }
    if (c === 0x28) depth++;
    if (c === 0x29 && --depth === 0) break;
    out.push(c & 0xff);
  }
  return Buffer.from(out);
}

/** Every /Title string in a chunk of PDF text (read as Latin-1), in file order. */
function titlesIn(text: string): string[] {
  const titles: string[] = [];
  const re = /\/Title\s*([(<])/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(text))) {
    const start = m.index + m[0].length;
    if (m[1] === '(') titles.push(decodePdfString(literalAt(text, start)));
    else {
      const end = text.indexOf('>', start);
      if (end < 0) continue;
      const hex = text.slice(start, Math.min(end, start + 8192)).replace(/[^0-9a-fA-F]/g, '');
      titles.push(decodePdfString(Buffer.from(hex.length % 2 ? `${hex}0` : hex, 'hex')));
    }
  }
  // XMP: <dc:title><rdf:Alt><rdf:li xml:lang="x-default">…</rdf:li>
  const xmp = /<dc:title>[\s\S]{0,200}?<rdf:li[^>]*>([^<]{1,2000})<\/rdf:li>/g;
  while ((m = xmp.exec(text))) titles.push(m[1].replace(/&amp;/g, '&').replace(/&lt;/g, '<').replace(/&gt;/g, '>'));
  return titles;
}

/** The issued sheet a PDF claims to be, or null when its metadata names none. */
export function pdfClaim(bytes: Buffer): PdfClaim | null {
  const text = bytes.toString('latin1');
  const pick = (titles: string[]) => {
    for (let i = titles.length - 1; i >= 0; i--) {
      const c = CLAIM.exec(titles[i]);
      if (c) return { sheetId: Number(c[1]), fingerprint: c[2], title: titles[i] };
    }
    return null;
  };
  const plain = pick(titlesIn(text));
  if (plain) return plain;
  // Compressed object streams (and XMP streams): inflate each Flate stream, within limits.
  const found: string[] = [];
  const re = /stream\r?\n/g;
  let m: RegExpExecArray | null;
  let streams = 0;
  let total = 0;
  while ((m = re.exec(text)) && streams < MAX_STREAMS && total < MAX_TOTAL_INFLATED) {
    const start = m.index + m[0].length;
    const end = text.indexOf('endstream', start);
    if (end < 0) break;
    streams++;
    try {
      const out = zlib.inflateSync(bytes.subarray(start, end), { maxOutputLength: MAX_INFLATED, finishFlush: zlib.constants.Z_SYNC_FLUSH });
      total += out.length;
      found.push(...titlesIn(out.toString('latin1')));
    } catch {
      // not Flate, or cut short: skip it
    }
    re.lastIndex = end;
  }
  return pick(found);
}
