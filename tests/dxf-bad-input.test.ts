// Refusals of files that are not usable ASCII DXF. Signatures: binary DXF sentinel
// "AutoCAD Binary DXF" (DXF Reference, Autodesk, "Binary DXF Files"); DWG files open with their
// version string "AC10xx" (from memory); zip "PK\x03\x04", PNG "\x89PNG\r\n\x1a\n", JPEG FF D8 FF,
// GIF "GIF89a", PDF "%PDF-" (the formats' published magic numbers, from memory). Every ASCII
// DXF ends with the group 0 / EOF (DXF Reference, Autodesk, "DXF Files: General Structure").
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { dxfDecode, dxfImport, dxfParse, dxfParseBytes, dxfSniff, DxfImportError, type DxfImportErrorCode } from '@shared/dxf-import';

const fixture = readFileSync(path.resolve(__dirname, 'fixtures/dxf/r2000-faults-mm.dxf'), 'latin1');
const enc = (s: string) => Uint8Array.from(s, (c) => c.charCodeAt(0) & 0xff);

function refusal(f: () => unknown): DxfImportError {
  try {
    f();
  } catch (e) {
    expect(e).toBeInstanceOf(DxfImportError);
    return e as DxfImportError;
  }
  throw new Error('expected a DxfImportError');
}

describe('files that are not ASCII DXF', () => {
  const cases: [string, Uint8Array, DxfImportErrorCode, RegExp][] = [
    ['an empty file', new Uint8Array(0), 'empty-file', /empty/],
    ['a file of blank lines', enc('\r\n \n\t\n'), 'empty-file', /empty/],
    ['a binary DXF', enc('AutoCAD Binary DXF\r\n\x1a\x00\x00\x00'), 'binary-dxf', /binary DXF.*ASCII/],
    ['a DWG', enc('AC1032\x00\x00\x00\x00\x00\x00\x07'), 'dwg-file', /DWG.*ASCII DXF/],
    ['a zip', enc('PK\x03\x04\x14\x00\x00\x00'), 'zip-file', /zip archive/],
    ['a PNG', enc('\x89PNG\r\n\x1a\n\x00\x00\x00\rIHDR'), 'image-file', /PNG image/],
    ['a JPEG', enc('\xff\xd8\xff\xe0\x00\x10JFIF\x00'), 'image-file', /JPEG image/],
    ['a GIF', enc('GIF89a\x01\x00\x01\x00'), 'image-file', /GIF image/],
    ['a PDF', enc('%PDF-1.7\n%\xe2\xe3\xcf\xd3\n'), 'pdf-file', /PDF/],
    ['a text file', enc('Truss T1, span 12 m\nsee drawing\n'), 'not-dxf', /not a DXF/],
    ['UTF-16 text', enc('\xff\xfe0\x00\n\x00'), 'not-dxf', /UTF-16/],
  ];
  for (const [what, bytes, code, msg] of cases) {
    it(`when the upload is ${what}, then it is refused with code ${code} and says what to do`, () => {
      const e = refusal(() => dxfParseBytes(bytes));
      expect(e.code).toBe(code);
      expect(e.message).toMatch(msg);
      // the same refusal when the server decoded the bytes as latin1 itself
      const e2 = refusal(() => dxfParse(Array.from(bytes, (b) => String.fromCharCode(b)).join('')));
      expect(e2.code).toBe(code);
    });
  }

  it('when the bytes are sniffed, then an ASCII DXF (with a UTF-8 byte order mark) is told from the others', () => {
    expect(dxfSniff(enc(fixture)).kind).toBe('ascii-dxf');
    expect(dxfSniff(enc('\xef\xbb\xbf  0\r\nSECTION\r\n')).kind).toBe('ascii-dxf');
    expect(dxfSniff(enc('AC1015xx')).kind).toBe('dwg');
  });

  it('when a PNG was decoded as UTF-8 by someone else, then the text is still recognised', () => {
    const text = new TextDecoder().decode(enc('\x89PNG\r\n\x1a\n\x00\x00'));
    expect(refusal(() => dxfParse(text)).code).toBe('image-file');
  });
});

describe('damaged ASCII DXF', () => {
  it('when the file is cut off before EOF, then it is refused as truncated naming the last line', () => {
    const cut = fixture.slice(0, Math.floor(fixture.length * 0.6));
    const e = refusal(() => dxfParse(cut));
    expect(e.code).toBe('truncated');
    expect(e.message).toMatch(/without the EOF marker.*Upload the complete file again/);
  });

  it('when a group-code line holds text, then the line is named', () => {
    const lines = fixture.split('\n');
    lines[20] = 'xyz';
    const e = refusal(() => dxfParse(lines.join('\n')));
    expect(e.code).toBe('malformed');
    expect(e.message).toMatch(/^Line 21 of the file should hold a DXF group code/);
  });

  it('when a POLYLINE lacks its SEQEND, then the file is refused instead of the parser hanging', () => {
    const text = ['0', 'SECTION', '2', 'ENTITIES', '0', 'POLYLINE', '8', 'T', '70', '0', '0', 'VERTEX', '10', '0', '20', '0', '0', 'LINE', '10', '0', '20', '0', '11', '1', '21', '1', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    const e = refusal(() => dxfParse(text));
    expect(e.code).toBe('malformed');
    expect(e.message).toMatch(/POLYLINE at line 5 is not closed by a SEQEND/);
  });

  it('when the LAYER table holds a foreign record, then the file is refused instead of the parser hanging', () => {
    const text = ['0', 'SECTION', '2', 'TABLES', '0', 'TABLE', '2', 'LAYER', '0', 'LAYER', '2', 'A', '0', 'LAYEX', '2', 'B', '0', 'ENDTAB', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    expect(refusal(() => dxfParse(text)).message).toMatch(/LAYER table holds a "LAYEX" record at line 13 before its ENDTAB/);
  });

  it('when an LWPOLYLINE promises more vertices than it lists, then the file is refused instead of the parser looping', () => {
    const text = ['0', 'SECTION', '2', 'ENTITIES', '0', 'LWPOLYLINE', '8', 'T', '90', '999999999', '10', '0', '20', '0', '10', '1', '20', '0', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    expect(refusal(() => dxfParse(text)).message).toMatch(/says it has 999999999 vertices but lists 2/);
  });

  it('when an LWPOLYLINE carries vertex ids (group 91), then all its vertices are still read', () => {
    const text = ['0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '6', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', '0', 'LWPOLYLINE', '8', 'T', '90', '3', '70', '0', '10', '0', '20', '0', '91', '1', '10', '1', '20', '0', '91', '2', '10', '1', '20', '1', '91', '3', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    const r = dxfImport(dxfParse(text));
    expect(r.members).toHaveLength(2);
    expect(r.joints).toHaveLength(3);
  });

  it('when a coordinate is not a number or is enormous, then the entity is named', () => {
    const line = (x: string) => ['0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', '0', 'LINE', '5', '2A', '8', 'TRUSS', '10', '0', '20', '0', '11', x, '21', '0', '0', 'LINE', '8', 'TRUSS', '10', '0', '20', '0', '11', '0', '21', '100', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    const nan = refusal(() => dxfImport(dxfParse(line('abc'))));
    expect(nan.code).toBe('bad-coordinate');
    expect(nan.message).toMatch(/LINE \(handle 2A, layer "TRUSS"\) has a coordinate that is not a number/);
    const far = refusal(() => dxfImport(dxfParse(line('1e300'))));
    expect(far.code).toBe('coordinate-too-large');
    expect(far.message).toMatch(/LINE \(handle 2A, layer "TRUSS"\) lies 1\.00 × 10²⁹⁷ m from the origin/);
  });

  it('when a drawing holds no lines at all, then it says what it does hold', () => {
    const text = ['0', 'SECTION', '2', 'HEADER', '9', '$INSUNITS', '70', '4', '0', 'ENDSEC', '0', 'SECTION', '2', 'ENTITIES', '0', 'CIRCLE', '8', 'A', '10', '0', '20', '0', '40', '1', '0', 'ENDSEC', '0', 'EOF', ''].join('\n');
    const e = refusal(() => dxfImport(dxfParse(text)));
    expect(e.code).toBe('no-lines');
    expect(e.message).toBe('The drawing holds no lines or polylines on any layer (it holds 1 circle). Draw the truss members as lines or polylines and upload again.');
  });

  it('when options are malformed, then they are refused with bad-option', () => {
    const parsed = dxfParse(fixture);
    expect(refusal(() => dxfImport(parsed, { tolerance: -1 })).code).toBe('bad-option');
    expect(refusal(() => dxfImport(parsed, { units: 'yd' as never })).code).toBe('bad-option');
  });

  it('when the bytes are latin1 text with accented layer names, then they decode byte for byte', () => {
    const text = fixture.replace(/WEBS/g, 'WEBS_É');
    const bytes = enc(text); // É as the single byte 0xC9: not valid UTF-8, so read as latin1
    expect(dxfDecode(bytes)).toBe(text);
    expect(dxfImport(dxfParseBytes(bytes)).layers).toEqual(['CHORDS', 'WEBS_É']);
  });
});
