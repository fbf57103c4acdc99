// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { boxOfPoints, cameraFit, cameraPan, cameraReveal, cameraToScreen, cameraToWorld, cameraZoomAt } from './camera';

const size = { width: 800, height: 400 };

describe('camera maths (checks are closed-form: linear maps and their inverses, worked by hand)', () => {
  it('when a 12 m × 3 m truss is fitted into 800 × 400 px with 40 px padding, then 720/12 = 60 px/m wins over 320/3 and the centre is the box centre', () => {
    const camera = cameraFit({ minX: 0, minY: 0, maxX: 12, maxY: 3 }, size, 40);
    expect(camera.scale).toBeCloseTo(60, 10);
    expect(camera.cx).toBeCloseTo(6, 10);
    expect(camera.cy).toBeCloseTo(1.5, 10);
  });

  it('when the box is taller than wide, then the height sets the scale: 320 px / 8 m = 40 px/m', () => {
    expect(cameraFit({ minX: 0, minY: 0, maxX: 2, maxY: 8 }, size, 40).scale).toBeCloseTo(40, 10);
  });

  it('when the box is a single point, then it is shown with a 1 m span on the tighter side (320 px/m)', () => {
    const camera = cameraFit({ minX: 5, minY: 5, maxX: 5, maxY: 5 }, size, 40);
    expect(camera.scale).toBeCloseTo(320, 10);
    expect([camera.cx, camera.cy]).toEqual([5, 5]);
  });

  it('when a vertical line is fitted, then its height alone sets the scale', () => {
    expect(cameraFit({ minX: 1, minY: 0, maxX: 1, maxY: 4 }, size, 40).scale).toBeCloseTo(80, 10);
  });

  it('when a point above the centre is drawn, then it lands above the screen centre: the y axis is flipped', () => {
    const camera = { cx: 0, cy: 0, scale: 10 };
    expect(cameraToScreen(camera, size, { x: 2, y: 3 })).toEqual({ x: 420, y: 170 });
  });

  it('when a world point goes to the screen and back, then it is where it started', () => {
    const camera = { cx: 3.2, cy: -1.7, scale: 47.5 };
    const world = { x: 11.25, y: 0.4 };
    const back = cameraToWorld(camera, size, cameraToScreen(camera, size, world));
    expect(back.x).toBeCloseTo(world.x, 12);
    expect(back.y).toBeCloseTo(world.y, 12);
  });

  it('when zooming in under the cursor, then the world point under the cursor stays under it and the scale is multiplied', () => {
    const camera = { cx: 6, cy: 1.5, scale: 60 };
    const cursor = { x: 610, y: 95 };
    const before = cameraToWorld(camera, size, cursor);
    const zoomed = cameraZoomAt(camera, size, cursor, 2);
    expect(zoomed.scale).toBeCloseTo(120, 10);
    const after = cameraToWorld(zoomed, size, cursor);
    expect(after.x).toBeCloseTo(before.x, 10);
    expect(after.y).toBeCloseTo(before.y, 10);
  });

  it('when zooming far past the limit, then the scale stops at 10⁵ px/m', () => {
    expect(cameraZoomAt({ cx: 0, cy: 0, scale: 5e4 }, size, { x: 0, y: 0 }, 1000).scale).toBe(1e5);
  });

  it('when the pointer drags 60 px right and 30 px down at 30 px/m, then the drawing follows: the centre moves 2 m left and 1 m up', () => {
    expect(cameraPan({ cx: 0, cy: 0, scale: 30 }, 60, 30)).toEqual({ cx: -2, cy: 1, scale: 30 });
  });

  it('when the place to reveal is already in view, then the view does not move', () => {
    const camera = { cx: 0, cy: 0, scale: 60 };
    // x 2.5…2.7 m → 550…562 px, y 0.8…1.0 m → 140…152 px: inside 800 × 400 less 36 px.
    expect(cameraReveal(camera, size, { minX: 2.5, minY: 0.8, maxX: 2.7, maxY: 1.0 })).toBe(camera);
  });

  it('when a small place outside the view is revealed, then it is centred at the present zoom', () => {
    const camera = { cx: 0, cy: 0, scale: 60 };
    // x 7.5 m → 850 px: beyond the 800 px viewport.
    const revealed = cameraReveal(camera, size, { minX: 7.5, minY: 0.8, maxX: 7.7, maxY: 1.0 });
    expect(revealed.scale).toBe(60);
    expect(revealed.cx).toBeCloseTo(7.6, 12);
    expect(revealed.cy).toBeCloseTo(0.9, 12);
  });

  it('when a place wider than the view is revealed, then the view zooms out just enough to fit it', () => {
    const revealed = cameraReveal({ cx: 0, cy: 0, scale: 200 }, size, { minX: 0, minY: 0, maxX: 24, maxY: 1 }, 40);
    expect(revealed.scale).toBeCloseTo(30, 10);
  });

  it('when points include NaN, then the box is of the finite ones; with none, it is null', () => {
    expect(boxOfPoints([{ x: 1, y: 2 }, { x: Number.NaN, y: 0 }, { x: -3, y: 5 }])).toEqual({ minX: -3, minY: 2, maxX: 1, maxY: 5 });
    expect(boxOfPoints([])).toBeNull();
  });
});
