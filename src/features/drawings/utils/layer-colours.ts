// Quiet inks for member layers, chosen to sit on warm paper and to stay apart from the accent
// (selection) and from the teal/amber that mean tension/compression elsewhere in the app.
export const LAYER_INKS = ['#2b2d2f', '#3d5a80', '#7a4f74', '#6b5a2e', '#4d6b45', '#8a4b3c', '#4a6670', '#5b4f8a'] as const;

/**
 * FNV-1a, 32 bits, over the name's UTF-16 code units (offset basis 2166136261, prime 16777619:
 * the published FNV parameters, from memory). Any stable hash would do; this one is short.
 */
export function layerNameHash(name: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < name.length; i++) {
    h ^= name.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}

/** The ink of one layer: from its name alone, so it is the same in every drawing version. */
export function layerColour(name: string): string {
  return LAYER_INKS[layerNameHash(name) % LAYER_INKS.length]!;
}

/**
 * One colour per layer name, derived from the name (never from the order the layers come in),
 * so a layer keeps its colour across drawing versions and re-imports whatever else changes.
 * Two layers of one drawing may share an ink; the layer list names each beside its swatch.
 */
export function layerColours(layerNames: readonly string[]): Map<string, string> {
  const colours = new Map<string, string>();
  for (const name of layerNames) colours.set(name, layerColour(name));
  return colours;
}
