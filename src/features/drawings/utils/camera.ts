import type { DxfExtent, DxfPoint } from '@shared/dxf-import';

/**
 * How the drawing sits in its SVG viewport: the world point (metres, drawing axes, y up) at
 * the viewport's centre and the scale in screen pixels per metre. Screen y runs down, so
 * every conversion flips the y axis.
 */
export interface Camera {
  cx: number;
  cy: number;
  /** Screen pixels per metre. */
  scale: number;
}

/** Viewport size in screen pixels. */
export interface ViewportSize {
  width: number;
  height: number;
}

/** Zoom limits in pixels per metre: 0.01 px/m shows 100 km across a screen, 10⁵ px/m a 0.01 mm gap as 1 px. */
export const CAMERA_MIN_SCALE = 0.01;
export const CAMERA_MAX_SCALE = 1e5;

/** Room kept free around a fitted box, screen pixels. */
export const CAMERA_FIT_PADDING = 36;

// A single point (or a line along one axis) has no size to fit: show this much around it, metres.
const DEGENERATE_SPAN = 1;

function clampScale(scale: number): number {
  return Math.min(CAMERA_MAX_SCALE, Math.max(CAMERA_MIN_SCALE, scale));
}

/** The world point (metres) drawn at a screen point (pixels from the viewport's top left). */
export function cameraToWorld(camera: Camera, size: ViewportSize, screen: DxfPoint): DxfPoint {
  return {
    x: camera.cx + (screen.x - size.width / 2) / camera.scale,
    y: camera.cy - (screen.y - size.height / 2) / camera.scale,
  };
}

/** The screen point (pixels from the viewport's top left) where a world point (metres) is drawn. */
export function cameraToScreen(camera: Camera, size: ViewportSize, world: DxfPoint): DxfPoint {
  return {
    x: size.width / 2 + (world.x - camera.cx) * camera.scale,
    y: size.height / 2 - (world.y - camera.cy) * camera.scale,
  };
}

/**
 * The camera that shows the whole box centred with `padding` pixels free on the tighter side.
 * A box with no width or height (one joint, a single vertical line) gets a 1 m span on that side.
 */
export function cameraFit(box: DxfExtent, size: ViewportSize, padding = CAMERA_FIT_PADDING): Camera {
  const spanX = box.maxX - box.minX;
  const spanY = box.maxY - box.minY;
  const usableW = Math.max(1, size.width - 2 * padding);
  const usableH = Math.max(1, size.height - 2 * padding);
  const w = spanX > 0 ? spanX : spanY > 0 ? 0 : DEGENERATE_SPAN;
  const h = spanY > 0 ? spanY : spanX > 0 ? 0 : DEGENERATE_SPAN;
  const scale = Math.min(w > 0 ? usableW / w : Infinity, h > 0 ? usableH / h : Infinity);
  return { cx: (box.minX + box.maxX) / 2, cy: (box.minY + box.maxY) / 2, scale: clampScale(scale) };
}

/**
 * Zooms by `factor` (> 1 closer) about a screen point, keeping the world point under it in
 * place, as a wheel zoom under the cursor should.
 */
export function cameraZoomAt(camera: Camera, size: ViewportSize, screen: DxfPoint, factor: number): Camera {
  const anchor = cameraToWorld(camera, size, screen);
  const scale = clampScale(camera.scale * factor);
  return {
    cx: anchor.x - (screen.x - size.width / 2) / scale,
    cy: anchor.y + (screen.y - size.height / 2) / scale,
    scale,
  };
}

/** Moves the drawing with the pointer: dx, dy in screen pixels (right, down). */
export function cameraPan(camera: Camera, dx: number, dy: number): Camera {
  return { cx: camera.cx - dx / camera.scale, cy: camera.cy + dy / camera.scale, scale: camera.scale };
}

/**
 * Brings a box into view with as little movement as possible: left as it is when the box is
 * already inside the viewport (less the padding), centred at the present zoom when it fits
 * there, otherwise zoomed out just enough to fit it (never zoomed in, so the reader keeps
 * their place).
 */
export function cameraReveal(camera: Camera, size: ViewportSize, box: DxfExtent, padding = CAMERA_FIT_PADDING): Camera {
  const topLeft = cameraToScreen(camera, size, { x: box.minX, y: box.maxY });
  const bottomRight = cameraToScreen(camera, size, { x: box.maxX, y: box.minY });
  const inside =
    topLeft.x >= padding && topLeft.y >= padding && bottomRight.x <= size.width - padding && bottomRight.y <= size.height - padding;
  if (inside) return camera;
  const fitted = cameraFit(box, size, padding);
  return {
    cx: fitted.cx,
    cy: fitted.cy,
    scale: Math.min(camera.scale, fitted.scale),
  };
}

/** The smallest box holding every point, or null for none. Non-finite points are skipped. */
export function boxOfPoints(points: Iterable<DxfPoint>): DxfExtent | null {
  let box: DxfExtent | null = null;
  for (const p of points) {
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) continue;
    if (!box) box = { minX: p.x, minY: p.y, maxX: p.x, maxY: p.y };
    else {
      box.minX = Math.min(box.minX, p.x);
      box.minY = Math.min(box.minY, p.y);
      box.maxX = Math.max(box.maxX, p.x);
      box.maxY = Math.max(box.maxY, p.y);
    }
  }
  return box;
}
