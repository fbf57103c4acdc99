// Quiet inks for member layers, chosen to sit on warm paper and to stay apart from the accent
// (selection) and from the teal/amber that mean tension/compression elsewhere in the app.
const LAYER_INKS = ['#2b2d2f', '#3d5a80', '#7a4f74', '#6b5a2e', '#4d6b45', '#8a4b3c', '#4a6670', '#5b4f8a'];

/**
 * One colour per layer name, in the order the layers are given (the file's own order), so a
 * layer keeps its colour across re-imports of the same drawing.
 */
export function layerColours(layerNames: readonly string[]): Map<string, string> {
  const colours = new Map<string, string>();
  layerNames.forEach((name, i) => colours.set(name, LAYER_INKS[i % LAYER_INKS.length]!));
  return colours;
}
