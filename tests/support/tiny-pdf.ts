import type { SheetRenderInput, SheetRenderer } from '../../server/modules/sheet-revisions/sheet-renderer';

/**
 * A real, small one-page PDF with the given lines of text (Helvetica, no compression), built
 * by hand after the file structure of ISO 32000-1 §7.5 (header, objects, cross-reference
 * table with 20-byte entries, trailer, startxref). Stands in for Chromium in API tests.
 */
export function tinyPdf(lines: string[]): Buffer {
  const esc = (s: string) => s.replace(/[\\()]/g, (c) => `\\${c}`).replace(/[^\x20-\x7e]/g, '?');
  const content = ['BT', '/F1 11 Tf', '50 790 Td', '14 TL', ...lines.map((l) => `(${esc(l)}) '`), 'ET'].join('\n');
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 595 842] /Resources << /Font << /F1 4 0 R >> >> /Contents 5 0 R >>',
    '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>',
    `<< /Length ${Buffer.byteLength(content, 'latin1')} >>\nstream\n${content}\nendstream`,
  ];
  let out = '%PDF-1.4\n';
  const offsets: number[] = [];
  objects.forEach((body, i) => {
    offsets.push(Buffer.byteLength(out, 'latin1'));
    out += `${i + 1} 0 obj\n${body}\nendobj\n`;
  });
  const xref = Buffer.byteLength(out, 'latin1');
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const o of offsets) out += `${String(o).padStart(10, '0')} 00000 n \n`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, 'latin1');
}

/** A renderer that prints the run, revision and signature block into a tiny PDF and remembers each call. */
export function tinyPdfRenderer(): SheetRenderer & { calls: SheetRenderInput[] } {
  const calls: SheetRenderInput[] = [];
  return {
    calls,
    async renderPdf(input) {
      calls.push(input);
      const s = input.signatures;
      const lines = [`Calc sheet of analysis run ${input.runId}`, `Revision ${input.revisionLabel}`];
      if (s) for (const sig of [s.preparedBy, s.checkedBy, s.issuedBy]) lines.push(`${sig.role}: ${sig.name}, ${sig.date}`);
      return tinyPdf(lines);
    },
  };
}
