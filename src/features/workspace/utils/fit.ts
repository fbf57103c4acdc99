/** A world point (m, y up). */
export interface WorldPoint {
  x: number;
  y: number;
}

/** World → screen for a drawing fitted into a box of `width` × `height` px with `padding` px free. */
export interface Fit {
  toScreen(p: WorldPoint): { x: number; y: number };
  /** px per m */
  scale: number;
}

/** Fits the points into the box, centred, y flipped (screen y runs down). */
export function fitPoints(points: readonly WorldPoint[], width: number, height: number, padding: number): Fit {
  if (points.length === 0) return { toScreen: () => ({ x: width / 2, y: height / 2 }), scale: 1 };
  const xs = points.map((p) => p.x);
  const ys = points.map((p) => p.y);
  const minX = Math.min(...xs);
  const maxX = Math.max(...xs);
  const minY = Math.min(...ys);
  const maxY = Math.max(...ys);
  const spanX = maxX - minX || 1;
  const spanY = maxY - minY || 1;
  const scale = Math.max(1e-9, Math.min((width - 2 * padding) / spanX, (height - 2 * padding) / spanY));
  const cx = (minX + maxX) / 2;
  const cy = (minY + maxY) / 2;
  return {
    scale,
    toScreen: (p) => ({ x: width / 2 + (p.x - cx) * scale, y: height / 2 - (p.y - cy) * scale }),
  };
}
