/**
 * A scale bar length for the present zoom: the largest 1, 2 or 5 × 10ⁿ metres that is drawn no
 * longer than `maxPixels`. Returns the length in metres and in pixels.
 */
export function scaleBarLength(pixelsPerMetre: number, maxPixels = 140): { metres: number; pixels: number } {
  const maxMetres = maxPixels / pixelsPerMetre;
  const decade = 10 ** Math.floor(Math.log10(maxMetres));
  const step = [5, 2, 1].find((s) => s * decade <= maxMetres) ?? 1;
  const metres = step * decade;
  return { metres, pixels: metres * pixelsPerMetre };
}

/** "500 mm", "2 m", "10 m": a scale bar's length written with its unit. */
export function formatScaleLength(metres: number): string {
  if (metres < 1) return `${Number((metres * 1000).toPrecision(3))} mm`;
  if (metres >= 1000) return `${Number((metres / 1000).toPrecision(3))} km`;
  return `${Number(metres.toPrecision(3))} m`;
}
