import QRCode from 'qrcode';
import { describe, expect, it } from 'vitest';
import { renderCalcSheetHtml } from './calc-sheet-html';
import { buildCalcSheetView } from './view/index';
import { sheetInput, triangleModel } from './view/view-fixtures';
import { qrSvg } from './verify-qr';

/** The dark modules of a drawn code, read back from the SVG path ("Mx yh1v1h-1z" per module, 4-module quiet zone). */
function modulesOf(svg: string): { size: number; dark: Set<string> } {
  const size = Number(/data-modules="(\d+)"/.exec(svg)![1]);
  const d = /<path fill="#000" d="([^"]*)"/.exec(svg)![1];
  const dark = new Set<string>();
  for (const m of d.matchAll(/M(\d+) (\d+)h1v1h-1z/g)) dark.add(`${Number(m[2]) - 4},${Number(m[1]) - 4}`);
  return { size, dark };
}

describe('verify QR code', () => {
  const url = 'https://calcs.example.test/verify/1234';

  it('when the verify address is drawn, then every module is the one the qrcode package computes for that address (QRCode.create, level M)', () => {
    // No QR decoder is installed: the check is against the encoder's own module matrix for the URL.
    const ref = QRCode.create(url, { errorCorrectionLevel: 'M' });
    const drawn = modulesOf(qrSvg(url));
    expect(drawn.size).toBe(ref.modules.size);
    let darkCount = 0;
    for (let r = 0; r < ref.modules.size; r++) {
      for (let c = 0; c < ref.modules.size; c++) {
        expect(drawn.dark.has(`${r},${c}`), `module ${r},${c}`).toBe(Boolean(ref.modules.get(r, c)));
        if (ref.modules.get(r, c)) darkCount++;
      }
    }
    expect(drawn.dark.size).toBe(darkCount);
    // The segments (byte and numeric modes, ISO/IEC 18004 §7.4) together hold the address itself and nothing else.
    const text = ref.segments.map((s) => {
      const data = (s as unknown as { data: Uint8Array | string }).data;
      return typeof data === 'string' ? data : Buffer.from(data).toString();
    });
    expect(text.join('')).toBe(url);
    // A different address gives a different drawing (the check can fail).
    expect(qrSvg(`${url}5`)).not.toBe(qrSvg(url));
  });

  it('when an issued sheet is rendered, then the last section carries the QR code of its verify address and the footer its id, revision and fingerprint', () => {
    const input = sheetInput(triangleModel(), { issue: { sheetId: 1234, fingerprint: '0123456789ab', fingerprintOf: 'of the record', verifyUrl: url } });
    const view = buildCalcSheetView(input);
    expect(view.issue).toMatchObject({ sheetId: 1234, revision: input.revision, fingerprint: '0123456789ab', verifyUrl: url });
    const html = renderCalcSheetHtml(view);
    expect(html).toContain(qrSvg(url));
    expect(html.indexOf('id="verify-copy"')).toBeGreaterThan(html.indexOf('class="end-mark"'));
    expect(html).toMatch(/@bottom-left \{\s*content: "[^"]*\\A Issued sheet 1234\\2002 ·\\2002 revision [^"]*fingerprint 0123456789ab/);
    expect(html).toContain(`<title>${input.project.jobNumber} ${input.subject} — rev ${input.revision} — issued sheet 1234, fingerprint 0123456789ab</title>`);
    // A sheet that is not issued has neither.
    const draft = renderCalcSheetHtml(buildCalcSheetView(sheetInput(triangleModel())));
    expect(draft).not.toContain('id="verify-copy"');
    expect(draft).not.toContain('Issued sheet');
  });
});
