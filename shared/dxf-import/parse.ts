import DxfParser from 'dxf-parser';
import type { IDxf } from 'dxf-parser';
import { DxfImportError } from './errors';
import type { DxfParsed } from './types';

/** What the first bytes of an upload say it is. */
export type DxfFileKind =
  | 'empty'
  | 'ascii-dxf'
  | 'binary-dxf'
  | 'dwg'
  | 'zip'
  | 'png'
  | 'jpeg'
  | 'gif'
  | 'pdf'
  | 'utf16'
  | 'unknown';

// Entity types dxf-parser 1.1 reads; anything else in ENTITIES/BLOCKS it skips silently.
const PARSER_ENTITY_TYPES = new Set([
  '3DFACE', 'ARC', 'ATTDEF', 'CIRCLE', 'DIMENSION', 'ELLIPSE', 'INSERT', 'LINE', 'LWPOLYLINE',
  'MTEXT', 'POINT', 'POLYLINE', 'SOLID', 'SPLINE', 'TEXT',
]);
// Structure words that are not drawn entities.
const STRUCTURE_WORDS = new Set(['VERTEX', 'SEQEND', 'BLOCK', 'ENDBLK', 'ENDSEC', 'SECTION', 'EOF']);

const BOM = '\uFEFF';
const BOM_AS_LATIN1 = '\u00EF\u00BB\u00BF';
const REPLACEMENT = '\uFFFD';

function startsWithBytes(bytes: Uint8Array, sig: number[], offset = 0): boolean {
  if (bytes.length < offset + sig.length) return false;
  for (let i = 0; i < sig.length; i++) if (bytes[offset + i] !== sig[i]) return false;
  return true;
}

function ascii(s: string): number[] {
  return Array.from(s, (c) => c.charCodeAt(0));
}

/**
 * Tells from the first bytes of a file what it is, without decoding it. Signatures: binary
 * DXF sentinel "AutoCAD Binary DXF" (DXF Reference, Autodesk, "Binary DXF Files"); DWG files
 * begin with their version string "AC10xx" (from memory); zip "PK\x03\x04", PNG "\x89PNG",
 * JPEG FF D8 FF, GIF "GIF8", PDF "%PDF-" (the formats' published magic numbers, from memory).
 */
export function dxfSniff(bytes: Uint8Array): { kind: DxfFileKind } {
  let start = 0;
  if (startsWithBytes(bytes, [0xef, 0xbb, 0xbf])) start = 3;
  let allBlank = true;
  for (let i = start; i < bytes.length; i++) {
    const b = bytes[i];
    if (b !== 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d) {
      allBlank = false;
      break;
    }
  }
  if (allBlank) return { kind: 'empty' };
  if (startsWithBytes(bytes, ascii('AutoCAD Binary DXF'))) return { kind: 'binary-dxf' };
  if (startsWithBytes(bytes, ascii('AC10')) && bytes.length >= 6 && isDigit(bytes[4]) && isDigit(bytes[5])) {
    return { kind: 'dwg' };
  }
  if (startsWithBytes(bytes, [0x50, 0x4b, 0x03, 0x04])) return { kind: 'zip' };
  if (startsWithBytes(bytes, [0x89, 0x50, 0x4e, 0x47])) return { kind: 'png' };
  if (startsWithBytes(bytes, [0xff, 0xd8, 0xff])) return { kind: 'jpeg' };
  if (startsWithBytes(bytes, ascii('GIF8'))) return { kind: 'gif' };
  if (startsWithBytes(bytes, ascii('%PDF-'))) return { kind: 'pdf' };
  if (startsWithBytes(bytes, [0xff, 0xfe]) || startsWithBytes(bytes, [0xfe, 0xff])) return { kind: 'utf16' };
  const n = Math.min(bytes.length, 4096);
  for (let i = start; i < n; i++) if (bytes[i] === 0) return { kind: 'unknown' };
  // An ASCII DXF opens with a group code: optional blanks, then an integer on its own line.
  let i = start;
  while (i < n && (bytes[i] === 0x20 || bytes[i] === 0x09 || bytes[i] === 0x0d || bytes[i] === 0x0a)) i++;
  if (i < n && bytes[i] === 0x2d) i++;
  const digitsFrom = i;
  while (i < n && isDigit(bytes[i])) i++;
  if (i === digitsFrom) return { kind: 'unknown' };
  while (i < n && (bytes[i] === 0x20 || bytes[i] === 0x09)) i++;
  if (i < bytes.length && bytes[i] !== 0x0d && bytes[i] !== 0x0a) return { kind: 'unknown' };
  return { kind: 'ascii-dxf' };
}

function isDigit(b: number): boolean {
  return b >= 0x30 && b <= 0x39;
}

function kindError(kind: DxfFileKind): DxfImportError | null {
  switch (kind) {
    case 'empty':
      return new DxfImportError('empty-file', 'The file is empty. Export the drawing from your CAD program as an ASCII DXF and upload that file.');
    case 'binary-dxf':
      return new DxfImportError('binary-dxf', 'The file is a binary DXF, which Panelpoint cannot read. Save the drawing again as an ASCII (text) DXF and upload that.');
    case 'dwg':
      return new DxfImportError('dwg-file', 'The file is a DWG drawing, not a DXF. Save or export it from your CAD program as an ASCII DXF and upload that.');
    case 'zip':
      return new DxfImportError('zip-file', 'The file is a zip archive, not a DXF. Unpack it and upload the ASCII DXF drawing inside.');
    case 'png':
    case 'jpeg':
    case 'gif':
      return new DxfImportError('image-file', `The file is a ${kind.toUpperCase()} image, not a DXF drawing. Upload the ASCII DXF exported from your CAD program instead.`);
    case 'pdf':
      return new DxfImportError('pdf-file', 'The file is a PDF, not a DXF drawing. Upload the ASCII DXF exported from your CAD program instead.');
    case 'utf16':
      return new DxfImportError('not-dxf', 'The file is UTF-16 text, which is not a DXF encoding. Save the drawing as an ASCII DXF (UTF-8 or ANSI) and upload that.');
    case 'unknown':
      return new DxfImportError('not-dxf', 'The file is not a DXF drawing: it does not begin with a DXF group code. Export the drawing from your CAD program as an ASCII DXF and upload that.');
    default:
      return null;
  }
}

/** Throws the {@link DxfImportError} a sniffed kind deserves; does nothing for 'ascii-dxf'. */
export function dxfAssertKind(kind: DxfFileKind): void {
  const e = kindError(kind);
  if (e) throw e;
}

/**
 * Decodes the raw bytes of an upload to the text {@link dxfParse} takes, after refusing
 * non-DXF signatures (see {@link dxfSniff}). Encoding: UTF-8 when the bytes are valid UTF-8
 * (every R2007+ DXF, and any pure-ASCII file), otherwise ISO-8859-1 (latin1), byte for byte,
 * which keeps the group codes and numbers of older ANSI-code-page files intact. A UTF-8 byte
 * order mark is dropped.
 */
export function dxfDecode(bytes: Uint8Array): string {
  dxfAssertKind(dxfSniff(bytes).kind);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    text = latin1(bytes);
  }
  return text.startsWith(BOM) ? text.slice(1) : text;
}

function latin1(bytes: Uint8Array): string {
  let out = '';
  const CHUNK = 8192;
  for (let i = 0; i < bytes.length; i += CHUNK) {
    out += String.fromCharCode.apply(null, Array.from(bytes.subarray(i, i + CHUNK)));
  }
  return out;
}

/** {@link dxfDecode} then {@link dxfParse}: the whole check-and-parse path for raw upload bytes. */
export function dxfParseBytes(bytes: Uint8Array): DxfParsed {
  return dxfParse(dxfDecode(bytes));
}

/** Sniffs decoded text for the same signatures as {@link dxfSniff}, as UTF-8 or latin1 left them. */
function textKind(text: string): DxfFileKind {
  if (text.trim() === '') return 'empty';
  if (text.startsWith('AutoCAD Binary DXF')) return 'binary-dxf';
  if (/^AC10\d\d/.test(text)) return 'dwg';
  if (text.startsWith('PK\u0003\u0004')) return 'zip';
  if (text.startsWith('\u0089PNG') || text.startsWith(REPLACEMENT + 'PNG')) return 'png';
  if (text.startsWith('\u00FF\u00D8\u00FF') || (text.startsWith(REPLACEMENT) && /^.{4,8}(JFIF|Exif)/s.test(text))) return 'jpeg';
  if (text.startsWith('GIF8')) return 'gif';
  if (text.startsWith('%PDF-')) return 'pdf';
  if (text.startsWith('\u00FF\u00FE') || text.startsWith('\u00FE\u00FF') || text.startsWith('\uFFFE')) return 'utf16';
  return 'ascii-dxf';
}

// Group-code ranges dxf-parser 1.1 knows how to type (anything else makes it log to the console).
function isKnownGroupCode(c: number): boolean {
  return (
    (c >= 0 && c <= 289) && !(c >= 150 && c <= 159) && !(c >= 180 && c <= 209) && !(c >= 240 && c <= 269)
  ) || (c >= 290 && c <= 481) || c === 999 || (c >= 1000 && c <= 1071);
}

function parseCode(line: string): number {
  // Fast integer parse of a trimmed group-code line; NaN when it is not a whole number.
  let i = 0;
  let end = line.length;
  while (i < end && (line.charCodeAt(i) === 32 || line.charCodeAt(i) === 9)) i++;
  while (end > i && (line.charCodeAt(end - 1) === 32 || line.charCodeAt(end - 1) === 9)) end--;
  if (i === end) return NaN;
  let neg = false;
  if (line.charCodeAt(i) === 45) {
    neg = true;
    i++;
  }
  if (i === end || end - i > 6) return NaN;
  let v = 0;
  for (; i < end; i++) {
    const d = line.charCodeAt(i) - 48;
    if (d < 0 || d > 9) return NaN;
    v = v * 10 + d;
  }
  return neg ? -v : v;
}

function clip(s: string, n = 40): string {
  const t = s.trim();
  return t.length > n ? `${t.slice(0, n)}…` : t;
}

/**
 * Checks the group-code structure of an ASCII DXF the way dxf-parser will walk it, so a
 * damaged file gets a sentence naming the line instead of a hang or a console message from
 * the parser (it loops forever on a POLYLINE without SEQEND, on a foreign record inside the
 * LAYER or VPORT table, and on an LWPOLYLINE promising more vertices than it lists).
 * Returns the lines to drop before parsing (LWPOLYLINE vertex ids, group 91, which
 * dxf-parser 1.1 mistakes for the end of the vertex list) and what it learnt on the way.
 */
function scanGroups(lines: string[]): {
  drop: number[];
  version: string | null;
  unread: Record<string, Record<string, number>>;
} {
  const drop: number[] = [];
  const unread: Record<string, Record<string, number>> = {};
  let version: string | null = null;
  let nLines = lines.length;
  if (nLines % 2 === 1 && lines[nLines - 1].trim() === '') nLines--;

  let section: string | null = null;
  let sawSection = false;
  let sawEof = false;
  let prevCode = -1;
  let prevValue = '';
  let headerVar = '';
  let tableName: string | null = null;
  let tableRecordWord: string | null = null;
  let entityType: string | null = null;
  let entityLine = 0;
  let entityLayer = '0';
  let lw90 = -1;
  let lw10 = 0;
  let lwInterrupted = -1; // line of a foreign group after an LWPOLYLINE vertex
  let polylineLine = -1; // line of an open POLYLINE awaiting SEQEND
  let blockLine = -1; // line of a BLOCK whose name (group 2) is still missing

  const lineNo = (i: number) => i + 1;

  const closeEntity = () => {
    if (entityType === 'LWPOLYLINE' && lw90 !== lw10) {
      throw new DxfImportError(
        'malformed',
        lw90 < 0
          ? `The LWPOLYLINE at line ${lineNo(entityLine)} does not say how many vertices it has (group 90). Open the drawing in your CAD program, save it again as DXF and upload that.`
          : `The LWPOLYLINE at line ${lineNo(entityLine)} says it has ${lw90} vertices but lists ${lw10}. The file is damaged; save it again from your CAD program and upload that.`,
      );
    }
    if (entityType && !PARSER_ENTITY_TYPES.has(entityType) && !STRUCTURE_WORDS.has(entityType) && (section === 'ENTITIES' || section === 'BLOCKS')) {
      const byLayer = (unread[entityType] ??= {});
      byLayer[entityLayer] = (byLayer[entityLayer] ?? 0) + 1;
    }
    entityType = null;
  };

  for (let i = 0; i + 1 < nLines; i += 2) {
    const code = parseCode(lines[i]);
    if (Number.isNaN(code)) {
      if (i === 0) {
        throw new DxfImportError('not-dxf', 'The file is not a DXF drawing: it does not begin with a DXF group code. Export the drawing from your CAD program as an ASCII DXF and upload that.');
      }
      throw new DxfImportError('malformed', `Line ${lineNo(i)} of the file should hold a DXF group code (a whole number) but holds "${clip(lines[i])}". The file is damaged or not a DXF; save it again from your CAD program and upload that.`);
    }
    if (!isKnownGroupCode(code)) {
      throw new DxfImportError('malformed', `Line ${lineNo(i)} holds group code ${code}, which is not a DXF group code. The file is damaged; save it again from your CAD program and upload that.`);
    }
    const raw = lines[i + 1];
    if (code === 0) {
      const value = raw.trim();
      closeEntity();
      if (polylineLine >= 0 && value !== 'VERTEX' && value !== 'SEQEND') {
        throw new DxfImportError('malformed', `The POLYLINE at line ${lineNo(polylineLine)} is not closed by a SEQEND before line ${lineNo(i)}. The file is damaged; save it again from your CAD program and upload that.`);
      }
      if (value === 'SEQEND') polylineLine = -1;
      // dxf-parser 1.1 loops forever on any other group 0 inside these two tables
      if (tableRecordWord && value !== tableRecordWord && value !== 'ENDTAB') {
        throw new DxfImportError('malformed', `The ${tableRecordWord} table holds a "${clip(value)}" record at line ${lineNo(i)} before its ENDTAB. The file is damaged; save it again from your CAD program and upload that.`);
      }
      if (blockLine >= 0) {
        throw new DxfImportError('malformed', `The block defined at line ${lineNo(blockLine)} has no name (group 2). The file is damaged; save it again from your CAD program and upload that.`);
      }
      if (value === 'EOF') {
        sawEof = true;
        break;
      }
      if (value === 'SECTION') {
        if (i + 3 >= nLines) break; // cut off right after SECTION: reported as truncated below
        const next = parseCode(lines[i + 2]);
        if (next !== 2) {
          throw new DxfImportError('malformed', `The SECTION at line ${lineNo(i)} has no name (group 2) after it. The file is damaged; save it again from your CAD program and upload that.`);
        }
        section = lines[i + 3].trim();
        sawSection = true;
        tableName = null;
        i += 2;
        prevCode = 2;
        prevValue = section;
        continue;
      }
      if (value === 'ENDSEC') {
        section = null;
        tableName = null;
      } else if (section === 'TABLES') {
        if (value === 'TABLE') {
          tableName = i + 3 < nLines ? lines[i + 3].trim() : '';
          tableRecordWord = tableName === 'LAYER' || tableName === 'VPORT' ? tableName : null;
        } else if (value === 'ENDTAB') {
          tableName = null;
          tableRecordWord = null;
        }
      } else if (section === 'ENTITIES' || section === 'BLOCKS') {
        if (value === 'BLOCK' && section === 'BLOCKS') blockLine = i;
        if (value === 'POLYLINE') polylineLine = i;
        entityType = value;
        entityLine = i;
        entityLayer = '0';
        lw90 = -1;
        lw10 = 0;
        lwInterrupted = -1;
      }
    } else if (section === 'HEADER') {
      if (code === 9) headerVar = raw.trim();
      else if (code === 1 && headerVar === '$ACADVER') version = raw.trim();
    } else if (entityType !== null) {
      if (code === 8) entityLayer = raw.trim();
      if (entityType === 'LWPOLYLINE') {
        // dxf-parser 1.1 reads the vertex list until a group it does not expect, then steps
        // back: a vertex x (10) without its y (20) makes it loop forever, and a foreign group
        // between vertices makes it drop the vertices before it.
        if (prevCode === 10 && code !== 20) {
          throw new DxfImportError('malformed', `A vertex of the LWPOLYLINE at line ${lineNo(entityLine)} has an x (line ${lineNo(i - 2)}) but no y after it. The file is damaged; save it again from your CAD program and upload that.`);
        }
        if (code === 90) lw90 = parseInt(raw, 10);
        else if (code === 10) {
          if (lwInterrupted >= 0) {
            throw new DxfImportError('malformed', `The vertex list of the LWPOLYLINE at line ${lineNo(entityLine)} is interrupted by an unexpected group at line ${lineNo(lwInterrupted)}. The file is damaged; save it again from your CAD program and upload that.`);
          }
          lw10++;
        } else if (code === 91) drop.push(i);
        else if (lw10 > 0 && code !== 20 && code !== 30 && code !== 40 && code !== 41 && code !== 42) lwInterrupted = i;
      }
    }
    if (blockLine >= 0 && code === 2) blockLine = -1;
    prevCode = code;
    prevValue = raw;
  }
  void prevCode;
  void prevValue;
  if (!sawSection) {
    throw new DxfImportError('not-dxf', 'The file is not a DXF drawing: it has no SECTION. Export the drawing from your CAD program as an ASCII DXF and upload that.');
  }
  if (!sawEof) {
    throw new DxfImportError('truncated', `The file stops at line ${nLines} without the EOF marker that ends every DXF, so it was cut off (an interrupted upload or copy). Upload the complete file again.`);
  }
  return { drop, version, unread };
}

/**
 * Checks and parses an ASCII DXF with dxf-parser. `text` is the file decoded as UTF-8 or as
 * latin1 (see {@link dxfDecode}); a UTF-8 byte order mark is allowed. Signatures of other
 * formats are recognised in either decoding.
 *
 * @throws DxfImportError 'empty-file' | 'binary-dxf' | 'dwg-file' | 'zip-file' | 'image-file'
 *   | 'pdf-file' | 'not-dxf' | 'truncated' | 'malformed' | 'unreadable', each with a sentence
 *   saying what is wrong and what to do. Nothing dxf-parser throws escapes unwrapped.
 */
export function dxfParse(text: string): DxfParsed {
  if (typeof text !== 'string') {
    throw new DxfImportError('not-dxf', 'The drawing was not passed as text. Decode the uploaded bytes with dxfDecode first.');
  }
  if (text.startsWith(BOM)) text = text.slice(1);
  else if (text.startsWith(BOM_AS_LATIN1)) text = text.slice(3);
  dxfAssertKind(textKind(text));
  let lines = text.split(/\r\n|\r|\n/);
  const { drop, version, unread } = scanGroups(lines);
  if (drop.length > 0) {
    const skip = new Set<number>();
    for (const i of drop) {
      skip.add(i);
      skip.add(i + 1);
    }
    lines = lines.filter((_, i) => !skip.has(i));
    text = lines.join('\n');
  }
  let dxf: IDxf | null;
  try {
    dxf = new DxfParser().parse(text);
  } catch (e) {
    const msg = e instanceof Error ? e.message.split('\n')[0].slice(0, 160) : 'unknown problem';
    if (/end of input|EOF group/i.test(msg)) {
      throw new DxfImportError('truncated', 'The file ends in the middle of a section, so it was cut off (an interrupted upload or copy). Upload the complete file again.');
    }
    throw new DxfImportError('unreadable', `The DXF reader could not read the file (${msg}). Open the drawing in your CAD program, save it again as an ASCII DXF and upload that.`);
  }
  if (!dxf) {
    throw new DxfImportError('unreadable', 'The DXF reader returned nothing for this file. Open the drawing in your CAD program, save it again as an ASCII DXF and upload that.');
  }
  dxf.entities ??= [];
  dxf.blocks ??= {};
  dxf.header ??= {};
  return { dxf, version, unreadEntities: unread, lineCount: lines.length };
}
