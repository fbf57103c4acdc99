import QRCode from 'qrcode';

/** Error correction of the verify code: M, about 15 % of the symbol recoverable (ISO/IEC 18004 §6.5.1). */
export const VERIFY_QR_LEVEL = 'M' as const;
/** Light margin around the symbol, in modules: the quiet zone of 4 modules (ISO/IEC 18004 §6.3.8). */
const QUIET = 4;

/**
 * The QR code of a text as an inline SVG, drawn from the module matrix of the qrcode package
 * (QRCode.create): one square path per dark module, no network, no image file. Synchronous and
 * free of I/O, so the sheet's view stays pure.
 */
export function qrSvg(text: string, sizeMm = 28): string {
  const { modules } = QRCode.create(text, { errorCorrectionLevel: VERIFY_QR_LEVEL });
  const n = modules.size;
  let d = '';
  for (let y = 0; y < n; y++) {
    for (let x = 0; x < n; x++) if (modules.get(y, x)) d += `M${x + QUIET} ${y + QUIET}h1v1h-1z`;
  }
  const side = n + 2 * QUIET;
  return (
    `<svg class="verify-qr" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${side} ${side}" width="${sizeMm}mm" height="${sizeMm}mm" ` +
    `shape-rendering="crispEdges" role="img" aria-label="QR code of ${text.replace(/[<>&"]/g, '')}" data-modules="${n}">` +
    `<rect width="${side}" height="${side}" fill="#fff"/><path fill="#000" d="${d}"/></svg>`
  );
}
