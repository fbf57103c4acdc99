import type { JointLoad, TrussModel } from '@shared/model/truss';
import type { JointForce, JointStep } from '@shared/solver';
import type { DeflectedShape } from '@shared/design/deflected-shape';

/**
 * SVG drawings of a truss, shared by the calc sheet (server) and the app's run results (client):
 * the truss with tags and dimensions, the loads of a case, the member force diagram, and a small
 * free-body diagram per joint. Pure string building (no DOM, no I/O), so both print the same.
 *
 * Model coordinates are metres, y up; drawings use a 1000-unit-wide view box, y down, and scale
 * to the width of the page. Tension, compression and zero force are told apart by colour, line
 * style and a written (T)/(C), so a grey-scale print loses nothing.
 */

/**
 * Panelpoint's drawing inks (docs/visual-language.md, "Drawings"; the same hexes as the tailwind
 * tokens): graphite for the truss, the paper for fills, the tension blue-green and the
 * compression umber. Tension, compression and zero are told by line before colour: tension a
 * thin continuous line, compression a heavy continuous line, zero force a faint dashed line.
 */
export const DRAWING_INK = {
  ink: '#26292b',
  soft: '#4f5357',
  faint: '#65696c',
  paper: '#fdfcf9',
  line: '#cfc8ba',
  accent: '#0f5a55',
  tension: '#17706a',
  compression: '#8a4b0f',
} as const;

/** Member force lines: tension thin, compression heavy, zero faint and dashed. */
export const FORCE_STYLE = {
  tension: { stroke: DRAWING_INK.tension, ink: DRAWING_INK.tension, width: 2, dash: '' },
  compression: { stroke: DRAWING_INK.compression, ink: DRAWING_INK.compression, width: 5, dash: '' },
  zero: { stroke: DRAWING_INK.faint, ink: DRAWING_INK.faint, width: 1.2, dash: '6 4' },
} as const;

const INK = DRAWING_INK.ink;
const FAINT = DRAWING_INK.faint;
const PAPER = DRAWING_INK.paper;
const VIEW_W = 1000;

/** Escapes text for SVG content and attribute values. */
export function svgEscape(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);
}

const f1 = (v: number) => (Math.round(v * 10) / 10).toString();

interface Frame {
  /** Model → view. */
  x(mx: number): number;
  y(my: number): number;
  scale: number;
  width: number;
  height: number;
}

interface Extent {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

function extentOf(model: TrussModel): Extent {
  const xs = model.joints.map((j) => j.x);
  const ys = model.joints.map((j) => j.y);
  return { minX: Math.min(...xs), maxX: Math.max(...xs), minY: Math.min(...ys), maxY: Math.max(...ys) };
}

/**
 * Fits the model into the view box with room for labels and dimensions around it.
 * `pad` = [top, right, bottom, left] in view units; `maxH` caps the drawing height so a tall
 * truss does not take a whole page.
 */
function frameFit(ext: Extent, pad: [number, number, number, number], maxH: number): Frame {
  const spanX = Math.max(ext.maxX - ext.minX, 1e-9);
  const spanY = Math.max(ext.maxY - ext.minY, 1e-9);
  const innerW = VIEW_W - pad[1] - pad[3];
  let scale = innerW / spanX;
  if (spanY * scale > maxH) scale = maxH / spanY;
  if (ext.maxX - ext.minX < 1e-9) scale = maxH / spanY;
  const drawnW = spanX * scale;
  const offsetX = pad[3] + (innerW - drawnW) / 2;
  const height = pad[0] + spanY * scale + pad[2];
  return {
    x: (mx) => offsetX + (mx - ext.minX) * scale,
    y: (my) => pad[0] + (ext.maxY - my) * scale,
    scale,
    width: VIEW_W,
    height,
  };
}

function svgOpen(frame: Frame, label: string, cls: string): string {
  return (
    `<svg class="${cls}" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${VIEW_W} ${f1(frame.height)}" ` +
    `role="img" aria-label="${svgEscape(label)}" font-family="Inter, 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', sans-serif">`
  );
}

/**
 * Text on a white box so it stays readable over lines. (A stroked "halo" would turn every label
 * into a Type 3 outline font in the PDF: bigger files and slower printing.)
 */
function haloText(x: number, y: number, text: string, attrs: string): string {
  const size = Number(/font-size="([\d.]+)"/.exec(attrs)?.[1] ?? 12);
  const w = text.length * size * 0.58 + 3;
  const h = size * 1.05;
  const anchor = /text-anchor="(start|end|middle)"/.exec(attrs)?.[1] ?? 'start';
  const left = anchor === 'start' ? x - 1.5 : anchor === 'end' ? x - w + 1.5 : x - w / 2;
  return `<rect x="${f1(left)}" y="${f1(y - size * 0.82)}" width="${f1(w)}" height="${f1(h)}" rx="2" fill="${PAPER}" fill-opacity="0.88"/><text x="${f1(x)}" y="${f1(y)}" ${attrs}>${subscriptText(text, size)}</text>`;
}

/**
 * A label whose symbol has a subscript ("R_A,y = 50.00 kN") typeset as in the equations: the
 * subscript lowered and smaller, never the raw underscore. Other labels are escaped as they are.
 */
export function subscriptText(text: string, size: number): string {
  // The subscript runs to " = " (a tag may hold spaces), or to the end of a bare symbol.
  const m = /^([A-Za-z])_(.+?)((?: = .*)?)$/s.exec(text);
  if (!m) return svgEscape(text);
  const shift = f1(size * 0.25);
  return `${svgEscape(m[1])}<tspan dy="${shift}" font-size="${f1(size * 0.72)}">${svgEscape(m[2])}</tspan><tspan dy="-${shift}">${svgEscape(m[3])}</tspan>`;
}

/** Direction (unit, model axes) pointing away from the members at a joint: where its tag goes. */
function openDirection(model: TrussModel, jointId: string): [number, number] {
  const j = model.joints.find((p) => p.id === jointId);
  if (!j) return [0, 1];
  let sx = 0;
  let sy = 0;
  for (const m of model.members) {
    const other = m.from === jointId ? m.to : m.to === jointId ? m.from : null;
    if (!other) continue;
    const o = model.joints.find((p) => p.id === other);
    if (!o) continue;
    const L = Math.hypot(o.x - j.x, o.y - j.y) || 1;
    sx += (o.x - j.x) / L;
    sy += (o.y - j.y) / L;
  }
  const L = Math.hypot(sx, sy);
  if (L < 1e-6) return [0.6, 0.8];
  return [-sx / L, -sy / L];
}

function supportSymbol(frame: Frame, x: number, y: number, kind: 'pin' | 'roller', angleDeg: number): string {
  // Drawn with the reaction pointing up (toward the joint), then turned to the reaction line.
  const rot = -(angleDeg - 90);
  const s = 13;
  const parts = [`<path d="M0 0 L${-s} ${s * 1.45} L${s} ${s * 1.45} Z" fill="${PAPER}" stroke="${INK}" stroke-width="1.6"/>`];
  let base = s * 1.45;
  if (kind === 'roller') {
    parts.push(
      `<circle cx="${-s * 0.55}" cy="${base + 4.5}" r="4" fill="${PAPER}" stroke="${INK}" stroke-width="1.4"/>`,
      `<circle cx="${s * 0.55}" cy="${base + 4.5}" r="4" fill="${PAPER}" stroke="${INK}" stroke-width="1.4"/>`,
    );
    base += 9;
  }
  parts.push(`<line x1="${-s * 1.5}" y1="${base}" x2="${s * 1.5}" y2="${base}" stroke="${INK}" stroke-width="1.6"/>`);
  for (let i = -3; i <= 2; i++) {
    const hx = i * s * 0.45 + s * 0.2;
    parts.push(`<line x1="${f1(hx)}" y1="${f1(base)}" x2="${f1(hx - 6)}" y2="${f1(base + 6)}" stroke="${FAINT}" stroke-width="1"/>`);
  }
  void frame;
  return `<g transform="translate(${f1(x)} ${f1(y)}) rotate(${f1(rot)})">${parts.join('')}</g>`;
}

function distinctSorted(values: number[], tol: number): number[] {
  const sorted = [...values].sort((a, b) => a - b);
  const out: number[] = [];
  for (const v of sorted) if (!out.length || v - out[out.length - 1] > tol) out.push(v);
  return out;
}

/** A horizontal dimension line with tick marks and the length written above it. */
function dimH(x1: number, x2: number, y: number, text: string, size: number): string {
  const t = (x: number) => `<line x1="${f1(x - 4)}" y1="${f1(y + 4)}" x2="${f1(x + 4)}" y2="${f1(y - 4)}" stroke="${INK}" stroke-width="1.3"/>`;
  const fits = Math.abs(x2 - x1) > text.length * size * 0.55 + 6;
  const label = fits ? `<text x="${f1((x1 + x2) / 2)}" y="${f1(y - 5)}" text-anchor="middle" font-size="${size}" fill="${INK}" class="tnum">${svgEscape(text)}</text>` : '';
  return `<line x1="${f1(x1)}" y1="${f1(y)}" x2="${f1(x2)}" y2="${f1(y)}" stroke="${INK}" stroke-width="0.9"/>${t(x1)}${t(x2)}${label}`;
}

/** A vertical dimension line with the length written beside it, turned. */
function dimV(y1: number, y2: number, x: number, text: string, size: number): string {
  const t = (y: number) => `<line x1="${f1(x - 4)}" y1="${f1(y + 4)}" x2="${f1(x + 4)}" y2="${f1(y - 4)}" stroke="${INK}" stroke-width="1.3"/>`;
  const fits = Math.abs(y2 - y1) > text.length * size * 0.55 + 6;
  const cy = (y1 + y2) / 2;
  const label = fits ? `<text x="${f1(x + 6)}" y="${f1(cy)}" transform="rotate(-90 ${f1(x + 6)} ${f1(cy)})" text-anchor="middle" dy="${f1(size * 0.75)}" font-size="${size}" fill="${INK}" class="tnum">${svgEscape(text)}</text>` : '';
  return `<line x1="${f1(x)}" y1="${f1(y1)}" x2="${f1(x)}" y2="${f1(y2)}" stroke="${INK}" stroke-width="0.9"/>${t(y1)}${t(y2)}${label}`;
}

function arrowHead(x: number, y: number, ux: number, uy: number, size: number, fill: string): string {
  // Tip at (x, y) pointing along (ux, uy) in view axes.
  const px = -uy;
  const py = ux;
  const bx = x - ux * size;
  const by = y - uy * size;
  return `<path d="M${f1(x)} ${f1(y)} L${f1(bx + px * size * 0.38)} ${f1(by + py * size * 0.38)} L${f1(bx - px * size * 0.38)} ${f1(by - py * size * 0.38)} Z" fill="${fill}"/>`;
}

/** Options for {@link trussGeometrySvg}. */
export interface GeometrySvgOptions {
  /** Writes a length given in metres, with its unit. */
  formatLength: (metres: number) => string;
  /** Writes a force given in kN, with its unit. */
  formatForce: (kN: number) => string;
  /** Joint loads to draw as arrows (kN, +y up); omit for the bare geometry. */
  loads?: JointLoad[];
  /** Draw the dimension chains (default true). */
  dimensions?: boolean;
  /** Draw member tags (default true; off for a loading diagram). */
  memberTags?: boolean;
  label: string;
}

/**
 * The truss with joint and member tags, support symbols, dimension chains (distinct joint x
 * below, distinct joint y at the right, each with the overall size) and, when given, load
 * arrows with their values.
 */
export function trussGeometrySvg(model: TrussModel, options: GeometrySvgOptions): string {
  const ext = extentOf(model);
  const dims = options.dimensions ?? true;
  const loads = (options.loads ?? []).filter((l) => Math.hypot(l.fx, l.fy) > 1e-12);
  const many = model.joints.length > 60;
  const font = many ? 11 : 15;
  const room = loads.length ? 84 : 0;
  const frame = frameFit(ext, [34 + room, dims ? 96 : 40, (dims ? 112 : 56) + room, 46], 380);
  const byId = new Map(model.joints.map((j) => [j.id, j]));
  const out: string[] = [svgOpen(frame, options.label, 'truss-drawing')];

  for (const m of model.members) {
    const a = byId.get(m.from);
    const b = byId.get(m.to);
    if (!a || !b) continue;
    out.push(`<line x1="${f1(frame.x(a.x))}" y1="${f1(frame.y(a.y))}" x2="${f1(frame.x(b.x))}" y2="${f1(frame.y(b.y))}" stroke="${INK}" stroke-width="2.4" stroke-linecap="round"/>`);
  }
  for (const sp of model.supports) {
    const j = byId.get(sp.joint);
    if (!j) continue;
    out.push(supportSymbol(frame, frame.x(j.x), frame.y(j.y), sp.kind, sp.kind === 'roller' ? sp.angleDeg : 90));
  }
  if (options.memberTags ?? true) {
    for (const m of model.members) {
      const a = byId.get(m.from);
      const b = byId.get(m.to);
      if (!a || !b) continue;
      out.push(haloText(frame.x((a.x + b.x) / 2), frame.y((a.y + b.y) / 2) + font * 0.35, m.tag, `text-anchor="middle" font-size="${font * 0.82}" font-style="italic" fill="${DRAWING_INK.soft}"`));
    }
  }
  for (const j of model.joints) {
    const [ox, oy] = openDirection(model, j.id);
    const cx = frame.x(j.x);
    const cy = frame.y(j.y);
    out.push(`<circle cx="${f1(cx)}" cy="${f1(cy)}" r="${many ? 2.6 : 3.8}" fill="${PAPER}" stroke="${INK}" stroke-width="1.6"/>`);
    const supported = model.supports.some((s) => s.joint === j.id);
    const loaded = loads.some((l) => l.joint === j.id);
    // A loaded joint's arrow runs along the open side: its tag moves beside the arrow instead.
    const dx = loaded ? font * 0.55 : ox * (font + 2);
    const dy = supported && oy < 0.3 ? -(font + 4) : -oy * (font + 2);
    const anchor = loaded ? 'start' : Math.abs(dx) < font * 0.4 ? 'middle' : dx > 0 ? 'start' : 'end';
    out.push(haloText(cx + dx, cy + dy + font * 0.35, j.tag, `text-anchor="${anchor}" font-size="${font}" font-weight="600" fill="${INK}"`));
  }

  if (loads.length) {
    const maxLoad = Math.max(...loads.map((l) => Math.hypot(l.fx, l.fy)));
    for (const l of loads) {
      const j = byId.get(l.joint);
      if (!j) continue;
      const mag = Math.hypot(l.fx, l.fy);
      const ux = l.fx / mag;
      const uy = -l.fy / mag; // view axes
      const len = 26 + 34 * (mag / maxLoad);
      // Directions (view axes) of the members at the joint: the arrow goes on the side with room,
      // onto the joint from outside (push) or hanging from it (pull).
      const dirs: [number, number][] = [];
      for (const m of model.members) {
        const other = m.from === j.id ? m.to : m.to === j.id ? m.from : null;
        const o = other ? byId.get(other) : undefined;
        if (!o) continue;
        const L = Math.hypot(o.x - j.x, o.y - j.y) || 1;
        dirs.push([(o.x - j.x) / L, -(o.y - j.y) / L]);
      }
      const clearance = (bx: number, by: number) => Math.min(Math.PI, ...dirs.map(([mx, my]) => Math.acos(Math.max(-1, Math.min(1, bx * mx + by * my)))));
      const push = clearance(-ux, -uy) >= clearance(ux, uy) - 1e-9;
      const jx = frame.x(j.x);
      const jy = frame.y(j.y);
      const side = push ? -1 : 1;
      const near = push ? 6 : 8;
      const tipX = push ? jx - ux * near : jx + ux * (near + len);
      const tipY = push ? jy - uy * near : jy + uy * (near + len);
      const tailX = push ? tipX - ux * len : jx + ux * near;
      const tailY = push ? tipY - uy * len : jy + uy * near;
      out.push(`<line x1="${f1(tailX)}" y1="${f1(tailY)}" x2="${f1(tipX - ux * 8)}" y2="${f1(tipY - uy * 8)}" stroke="${DRAWING_INK.soft}" stroke-width="1.8"/>`);
      out.push(arrowHead(tipX, tipY, ux, uy, 10, DRAWING_INK.soft));
      const endX = jx + side * ux * (near + len + 6);
      const endY = jy + side * uy * (near + len + 6);
      out.push(haloText(endX, endY + (side * uy > 0.5 ? font * 0.8 : side * uy < -0.5 ? -3 : font * 0.3), options.formatForce(mag), `text-anchor="middle" font-size="${font * 0.8}" fill="${DRAWING_INK.soft}" class="tnum"`));
    }
  }

  if (dims) {
    const tol = 5e-4;
    const xs = distinctSorted(model.joints.map((j) => j.x), tol);
    const ys = distinctSorted(model.joints.map((j) => j.y), tol);
    const base = frame.y(ext.minY) + 58;
    const right = frame.x(ext.maxX) + 46;
    const size = font * 0.78;
    if (xs.length > 2 && xs.length <= 24) {
      for (let i = 0; i + 1 < xs.length; i++) out.push(dimH(frame.x(xs[i]), frame.x(xs[i + 1]), base, options.formatLength(xs[i + 1] - xs[i]), size));
    }
    const overallY = xs.length > 2 && xs.length <= 24 ? base + 30 : base;
    if (xs.length >= 2) out.push(dimH(frame.x(xs[0]), frame.x(xs[xs.length - 1]), overallY, options.formatLength(ext.maxX - ext.minX), size));
    if (ys.length > 2 && ys.length <= 12) {
      for (let i = 0; i + 1 < ys.length; i++) out.push(dimV(frame.y(ys[i]), frame.y(ys[i + 1]), right, options.formatLength(ys[i + 1] - ys[i]), size));
    }
    const overallX = ys.length > 2 && ys.length <= 12 ? right + 30 : right;
    if (ys.length >= 2) out.push(dimV(frame.y(ys[0]), frame.y(ys[ys.length - 1]), overallX, options.formatLength(ext.maxY - ext.minY), size));
  }
  out.push('</svg>');
  return out.join('');
}

/** Sense of a member force for drawing, with a tolerance relative to the largest force. */
export function forceSenseOf(value: number, tolerance: number): 'T' | 'C' | '0' {
  if (Math.abs(value) <= tolerance) return '0';
  return value > 0 ? 'T' : 'C';
}

/** Options for {@link forceDiagramSvg}. */
export interface ForceDiagramOptions {
  /** Writes a force magnitude given in kN, without sign, with its unit or not. */
  formatMagnitude: (kN: number) => string;
  label: string;
  /** |force| at or below this counts as zero, kN. */
  zeroTolerance: number;
}

/**
 * The member force diagram: tension a thin continuous line, compression a heavy continuous line,
 * zero force a faint dashed line; each member labelled with its magnitude and T or C (0 for zero-force).
 */
export function forceDiagramSvg(model: TrussModel, forces: Record<string, number>, options: ForceDiagramOptions): string {
  const ext = extentOf(model);
  const many = model.members.length > 120;
  const font = many ? 9.5 : 13.5;
  const frame = frameFit(ext, [30, 40, 40, 40], 400);
  const byId = new Map(model.joints.map((j) => [j.id, j]));
  const out: string[] = [svgOpen(frame, options.label, 'force-diagram')];
  const labels: string[] = [];
  for (const m of model.members) {
    const a = byId.get(m.from);
    const b = byId.get(m.to);
    if (!a || !b) continue;
    const v = forces[m.id] ?? 0;
    const sense = forceSenseOf(v, options.zeroTolerance);
    const st = sense === 'T' ? FORCE_STYLE.tension : sense === 'C' ? FORCE_STYLE.compression : FORCE_STYLE.zero;
    const dash = st.dash ? ` stroke-dasharray="${st.dash}"` : '';
    out.push(
      `<line x1="${f1(frame.x(a.x))}" y1="${f1(frame.y(a.y))}" x2="${f1(frame.x(b.x))}" y2="${f1(frame.y(b.y))}" stroke="${st.stroke}" stroke-width="${st.width}"${dash} stroke-linecap="${sense === '0' ? 'round' : 'butt'}"/>`,
    );
    const text = sense === '0' ? '0' : `${options.formatMagnitude(Math.abs(v))} ${sense}`;
    labels.push(haloText(frame.x((a.x + b.x) / 2), frame.y((a.y + b.y) / 2) + font * 0.35, text, `text-anchor="middle" font-size="${font}" font-weight="600" fill="${st.ink}" class="tnum"`));
  }
  for (const j of model.joints) out.push(`<circle cx="${f1(frame.x(j.x))}" cy="${f1(frame.y(j.y))}" r="2.4" fill="${INK}"/>`);
  out.push(...labels, '</svg>');
  return out.join('');
}

/** The legend strip under a force diagram (also a small SVG, same styles). */
export function forceLegendSvg(): string {
  const item = (x: number, st: (typeof FORCE_STYLE)[keyof typeof FORCE_STYLE], text: string) => {
    const dash = st.dash ? ` stroke-dasharray="${st.dash}"` : '';
    return `<line x1="${x}" y1="14" x2="${x + 46}" y2="14" stroke="${st.stroke}" stroke-width="${st.width}"${dash}/><text x="${x + 56}" y="18.5" font-size="13" fill="${st.ink}">${svgEscape(text)}</text>`;
  };
  return (
    `<svg class="force-legend" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 1000 28" font-family="Inter, 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', sans-serif" role="img" aria-label="Legend">` +
    item(0, FORCE_STYLE.tension, 'Tension (T), thin line') +
    item(300, FORCE_STYLE.compression, 'Compression (C), heavy line') +
    item(640, FORCE_STYLE.zero, 'Zero force (0), dashed') +
    '</svg>'
  );
}

/** Options for {@link jointFbdSvg}. */
export interface JointFbdOptions {
  /** Writes a force magnitude in kN with its unit. */
  formatForce: (kN: number) => string;
  zeroTolerance: number;
}

/**
 * The plain symbol of a force on a joint, written the way {@link subscriptText} typesets it and
 * matching the equations' KaTeX symbol: member "F_AB", reaction "R_A,y" (or "R_M" along a roller's
 * line), load "P_C,y" (the letter the solver chose for loads: one no joint or member tag uses).
 */
export function forceSymbolText(f: JointForce, jointTag: string): string {
  if (f.ref.type === 'member') return `F_${f.label}`;
  if (f.ref.type === 'reaction') return f.label;
  const letter = /^([A-Za-z])_/.exec(f.symbol)?.[1] ?? 'P';
  return `${letter}_${jointTag},${f.ref.component}`;
}

function forceLabel(f: JointForce, jointTag: string, fmt: (kN: number) => string, tol: number): string {
  const name = forceSymbolText(f, jointTag);
  if (f.value === null) return `${name} = ?`;
  if (f.ref.type === 'member') {
    const s = forceSenseOf(f.value, tol);
    return s === '0' ? `${name} = 0` : `${name} = ${fmt(Math.abs(f.value))} (${s})`;
  }
  return `${name} = ${fmt(Math.abs(f.value))}`;
}

/**
 * Moves a 12 px label's anchor point so the whole label stays inside a figure `width` wide
 * (its width estimated from Inter's average figure and letter advance, about 0.56 em).
 */
function clampLabel(x: number, anchor: 'start' | 'middle' | 'end', text: string, width: number): number {
  const w = text.length * 6.7;
  const margin = 3;
  const left = anchor === 'start' ? x : anchor === 'end' ? x - w : x - w / 2;
  const shift = Math.max(margin - left, Math.min(0, width - margin - (left + w)));
  return x + shift;
}

/** Applied loads: solid blue line, filled head. */
export const LOAD_STYLE = { stroke: DRAWING_INK.soft, width: 2 } as const;
/** Support reactions: accent dashed line, open head, a short bar across the tail. */
export const REACTION_STYLE = { stroke: DRAWING_INK.accent, width: 2, dash: '5 3' } as const;
/** How far (view units) a reaction is drawn beside a load on the same line. */
const REACTION_OFFSET = 14;

/** A reaction arrow from (tail) to (tip) along (ux, uy): dashed, open head, bar across the tail. */
function reactionArrow(tailX: number, tailY: number, tipX: number, tipY: number, ux: number, uy: number): string {
  const st = REACTION_STYLE;
  const size = 10;
  const px = -uy;
  const py = ux;
  const bx = tipX - ux * size;
  const by = tipY - uy * size;
  return (
    `<line x1="${f1(tailX)}" y1="${f1(tailY)}" x2="${f1(bx)}" y2="${f1(by)}" stroke="${st.stroke}" stroke-width="${st.width}" stroke-dasharray="${st.dash}"/>` +
    `<line x1="${f1(tailX + px * 5)}" y1="${f1(tailY + py * 5)}" x2="${f1(tailX - px * 5)}" y2="${f1(tailY - py * 5)}" stroke="${st.stroke}" stroke-width="${st.width}"/>` +
    `<path d="M${f1(tipX)} ${f1(tipY)} L${f1(bx + px * size * 0.38)} ${f1(by + py * size * 0.38)} L${f1(bx - px * size * 0.38)} ${f1(by - py * size * 0.38)} Z" fill="${PAPER}" stroke="${st.stroke}" stroke-width="1.6" stroke-linejoin="round"/>`
  );
}

/** The key under a free-body diagram: how a load and a reaction are drawn. */
function fbdKey(height: number, load: boolean, reaction: boolean): string {
  const y = height - 9;
  const parts: string[] = [];
  let x = 8;
  if (load) {
    parts.push(`<line x1="${x}" y1="${y - 4}" x2="${x + 22}" y2="${y - 4}" stroke="${LOAD_STYLE.stroke}" stroke-width="${LOAD_STYLE.width}"/>`, arrowHead(x + 30, y - 4, 1, 0, 9, LOAD_STYLE.stroke));
    parts.push(`<text x="${x + 36}" y="${y}" font-size="10.5" fill="${LOAD_STYLE.stroke}">load</text>`);
    x += 84;
  }
  if (reaction) {
    parts.push(reactionArrow(x, y - 4, x + 30, y - 4, 1, 0));
    parts.push(`<text x="${x + 36}" y="${y}" font-size="10.5" fill="${REACTION_STYLE.stroke}">reaction</text>`);
  }
  return `<g class="fbd-key">${parts.join('')}</g>`;
}

/**
 * A joint's free-body diagram: the joint, a stub of each member with its force arrow (unknowns
 * drawn as tension, away from the joint; known forces in their actual sense), and loads and
 * reactions as arrows onto the joint, each labelled with its symbol as the equations write it
 * (F_AB, R_A,y, P_C,y with the subscript lowered). Loads and reactions differ in colour, line
 * (solid or dashed) and head (filled or open), and a reaction on a load's line is drawn beside it.
 */
export function jointFbdSvg(step: JointStep, options: JointFbdOptions): string {
  // Wide enough for "AB = 123.45 kN (C)" beyond a horizontal member's stub on either side.
  const W = 420;
  const H = 250;
  const cx = W / 2;
  const cy = H / 2;
  const out: string[] = [
    `<svg class="fbd" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${W} ${H}" role="img" aria-label="${svgEscape(`Free-body diagram of joint ${step.jointTag}`)}" font-family="Inter, 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', sans-serif">`,
  ];
  const all: { f: JointForce; unknown: boolean }[] = [
    ...step.known.map((f) => ({ f, unknown: false })),
    ...step.unknowns.map((f) => ({ f, unknown: true })),
  ];
  const labels: string[] = [];
  const memberDirs = all.filter(({ f }) => f.ref.type === 'member').map(({ f }): [number, number] => [f.cx, -f.cy]);
  const loadDirs = all.filter(({ f }) => f.ref.type === 'load' && f.value !== null && Math.abs(f.value) > 1e-12).map(({ f }): [number, number] => [f.cx, -f.cy]);
  const hasReaction = all.some(({ f }) => f.ref.type === 'reaction' && !(f.value !== null && Math.abs(f.value) <= 1e-12));
  const used: [number, number][] = [];
  const place = (x: number, y: number): [number, number] => {
    let py = y;
    for (let k = 0; k < 6; k++) {
      if (!used.some(([ux, uy]) => Math.abs(ux - x) < 70 && Math.abs(uy - py) < 13)) break;
      py += 13;
    }
    used.push([x, py]);
    return [x, py];
  };
  for (const { f, unknown } of all) {
    const ux = f.cx;
    const uy = -f.cy; // view axes
    if (Math.hypot(ux, uy) < 1e-9) continue;
    if (f.ref.type === 'member') {
      const len = 78;
      const ex = cx + ux * len;
      const ey = cy + uy * len;
      out.push(`<line x1="${cx}" y1="${cy}" x2="${f1(ex)}" y2="${f1(ey)}" stroke="${DRAWING_INK.line}" stroke-width="9" stroke-linecap="butt"/>`);
      const s = f.value === null ? 'T' : forceSenseOf(f.value, options.zeroTolerance);
      const st = unknown ? { stroke: INK, ink: INK, dash: '' } : s === 'T' ? FORCE_STYLE.tension : s === 'C' ? FORCE_STYLE.compression : FORCE_STYLE.zero;
      const a0 = 16;
      const a1 = 64;
      if (s === '0') {
        out.push(`<line x1="${f1(cx + ux * a0)}" y1="${f1(cy + uy * a0)}" x2="${f1(cx + ux * a1)}" y2="${f1(cy + uy * a1)}" stroke="${st.stroke}" stroke-width="1.6" stroke-dasharray="1.5 4" stroke-linecap="round"/>`);
      } else {
        const outward = s === 'T';
        const dash = st.dash ? ` stroke-dasharray="${st.dash}"` : '';
        const tipD = outward ? a1 : a0;
        const tailD = outward ? a0 : a1;
        const dir = outward ? 1 : -1;
        out.push(`<line x1="${f1(cx + ux * tailD)}" y1="${f1(cy + uy * tailD)}" x2="${f1(cx + ux * (tipD - dir * 8))}" y2="${f1(cy + uy * (tipD - dir * 8))}" stroke="${st.stroke}" stroke-width="2"${dash}/>`);
        out.push(arrowHead(cx + ux * tipD, cy + uy * tipD, ux * dir, uy * dir, 10, st.stroke));
      }
      const text = forceLabel(f, step.jointTag, options.formatForce, options.zeroTolerance);
      const style = `font-size="12" font-weight="${unknown ? 700 : 500}" fill="${unknown ? INK : st.ink}" class="tnum"`;
      const [lx, ly] = place(cx + ux * (len + 6), cy + uy * (len + 6) + 4);
      const anchor = ux > 0.3 ? 'start' : ux < -0.3 ? 'end' : 'middle';
      labels.push(haloText(clampLabel(lx, anchor, text, W), ly + (uy > 0.5 ? 8 : uy < -0.5 ? -2 : 0), text, `text-anchor="${anchor}" ${style}`));
    } else {
      if (f.value !== null && Math.abs(f.value) <= 1e-12) continue;
      const sign = f.value !== null && f.value < 0 ? -1 : 1;
      const dx = ux * sign;
      const dy = uy * sign;
      // Draw the arrow on the side of the joint with more room: pushing onto the joint from
      // outside (body on the −d side) or pulling away from it (body on the +d side).
      const clearance = (bx: number, by: number) =>
        Math.min(Math.PI, ...memberDirs.map(([mx, my]) => Math.acos(Math.max(-1, Math.min(1, bx * mx + by * my)))));
      const push = clearance(-dx, -dy) >= clearance(dx, dy) - 1e-9;
      const near = 9;
      const far = 62;
      const tipD = push ? near : far;
      const tailD = push ? far : near;
      const side = push ? -1 : 1;
      const tipX = cx + side * dx * tipD;
      const tipY = cy + side * dy * tipD;
      const tailX = cx + side * dx * tailD;
      const tailY = cy + side * dy * tailD;
      const isLoad = f.ref.type === 'load';
      const colour = isLoad ? LOAD_STYLE.stroke : REACTION_STYLE.stroke;
      // A reaction on the line of a load at this joint is drawn beside it, never on it, so the two
      // cannot read as one double-headed arrow; it also has its own dashed line and open head.
      const shift = !isLoad && loadDirs.some(([lx, ly]) => Math.abs(lx * dy - ly * dx) < 0.1) ? REACTION_OFFSET : 0;
      const ox = -dy * shift;
      const oy = dx * shift;
      if (isLoad) {
        out.push(`<line x1="${f1(tailX)}" y1="${f1(tailY)}" x2="${f1(tipX - dx * 8)}" y2="${f1(tipY - dy * 8)}" stroke="${colour}" stroke-width="${LOAD_STYLE.width}"/>`);
        out.push(arrowHead(tipX, tipY, dx, dy, 10, colour));
      } else {
        out.push(reactionArrow(tailX + ox, tailY + oy, tipX + ox, tipY + oy, dx, dy));
      }
      const endX = cx + side * dx * (far + 8) + ox;
      const endY = cy + side * dy * (far + 8) + oy;
      const [lx, ly] = place(endX, endY + 4);
      const ax = side * dx;
      const anchor = ax > 0.3 ? 'start' : ax < -0.3 ? 'end' : 'middle';
      const ay = side * dy;
      const text = forceLabel(f, step.jointTag, options.formatForce, options.zeroTolerance);
      labels.push(haloText(clampLabel(lx, anchor, text, W), ly + (ay > 0.5 ? 8 : ay < -0.5 ? -2 : 0), text, `text-anchor="${anchor}" font-size="12" font-weight="500" fill="${colour}" class="tnum"`));
    }
  }
  out.push(`<circle cx="${cx}" cy="${cy}" r="7" fill="${PAPER}" stroke="${INK}" stroke-width="2"/>`);
  out.push(haloText(cx + 10, cy - 10, step.jointTag, `font-size="14" font-weight="700" fill="${INK}"`));
  if (loadDirs.length || hasReaction) out.push(fbdKey(H, loadDirs.length > 0, hasReaction));
  out.push(...labels, '</svg>');
  return out.join('');
}

/** A part of a long truss drawn as its own row: the members whose midpoints fall in [x0, x1]. */
export interface TrussBand {
  model: TrussModel;
  /** m */
  x0: number;
  x1: number;
  /** Joints whose loads this band draws (a joint on a band edge belongs to the band on its left). */
  ownJoints: Set<string>;
}

/**
 * Splits a long, shallow truss into rows so that tags and force labels stay readable: at most
 * `maxMembers` members and a length-to-depth ratio of about `maxAspect` per row. Short trusses
 * come back whole (one band).
 */
export function trussBands(model: TrussModel, maxAspect = 6, maxMembers = 30): TrussBand[] {
  const ext = extentOf(model);
  const spanX = ext.maxX - ext.minX;
  const spanY = Math.max(ext.maxY - ext.minY, spanX / 50, 1e-9);
  const k = Math.max(1, Math.ceil(spanX / spanY / maxAspect), Math.ceil(model.members.length / maxMembers));
  const all = { model, x0: ext.minX, x1: ext.maxX, ownJoints: new Set(model.joints.map((j) => j.id)) };
  if (k === 1) return [all];
  const xs = distinctSorted(model.joints.map((j) => j.x), 5e-4);
  if (xs.length < 2 * k) return [all];
  const edges = Array.from({ length: k + 1 }, (_, i) => xs[Math.round((i * (xs.length - 1)) / k)]);
  const byId = new Map(model.joints.map((j) => [j.id, j]));
  const bands: TrussBand[] = [];
  for (let b = 0; b < k; b++) {
    const x0 = edges[b];
    const x1 = edges[b + 1];
    const last = b === k - 1;
    const members = model.members.filter((m) => {
      const p = byId.get(m.from);
      const q = byId.get(m.to);
      if (!p || !q) return false;
      const mid = (p.x + q.x) / 2;
      return mid >= x0 - 1e-9 && (last ? mid <= x1 + 1e-9 : mid < x1 - 1e-9);
    });
    const ids = new Set(members.flatMap((m) => [m.from, m.to]));
    const joints = model.joints.filter((j) => ids.has(j.id));
    const ownJoints = new Set(joints.filter((j) => j.x >= x0 - 1e-9 && (last ? true : j.x < x1 - 1e-9)).map((j) => j.id));
    bands.push({
      model: { ...model, joints, members, supports: model.supports.filter((s) => ids.has(s.joint)) },
      x0,
      x1,
      ownJoints,
    });
  }
  return bands;
}

export interface DeflectedShapeSvgOptions {
  label: string;
  /** The largest movement as the sheet writes it, e.g. "5.41 mm". */
  maxText: string;
}

/**
 * The deflected shape, exaggerated: the truss as drawn in thin grey dashes, the displaced truss
 * in ink over it, the joint that moves most marked and labelled, and the exaggeration written
 * under the drawing so nobody reads it as true to scale.
 */
export function deflectedShapeSvg(model: TrussModel, shape: DeflectedShape, options: DeflectedShapeSvgOptions): string {
  const moved = new Map(shape.joints.map((d) => [d.joint, d]));
  const displaced = (j: { id: string; x: number; y: number }) => {
    const d = moved.get(j.id);
    return { x: j.x + (shape.scale * (d?.ux ?? 0)) / 1000, y: j.y + (shape.scale * (d?.uy ?? 0)) / 1000 };
  };
  const after = new Map(model.joints.map((j) => [j.id, displaced(j)]));
  const before = extentOf(model);
  const xs = [...after.values()].map((p) => p.x);
  const ys = [...after.values()].map((p) => p.y);
  const ext = { minX: Math.min(before.minX, ...xs), maxX: Math.max(before.maxX, ...xs), minY: Math.min(before.minY, ...ys), maxY: Math.max(before.maxY, ...ys) };
  const frame = frameFit(ext, [24, 40, 56, 40], 360);
  const byId = new Map(model.joints.map((j) => [j.id, j]));
  const out: string[] = [svgOpen(frame, options.label, 'deflected-shape')];
  for (const m of model.members) {
    const a = byId.get(m.from);
    const b = byId.get(m.to);
    if (!a || !b) continue;
    out.push(`<line x1="${f1(frame.x(a.x))}" y1="${f1(frame.y(a.y))}" x2="${f1(frame.x(b.x))}" y2="${f1(frame.y(b.y))}" stroke="${FAINT}" stroke-width="1.2" stroke-dasharray="5 4"/>`);
  }
  for (const m of model.members) {
    const a = after.get(m.from);
    const b = after.get(m.to);
    if (!a || !b) continue;
    out.push(`<line x1="${f1(frame.x(a.x))}" y1="${f1(frame.y(a.y))}" x2="${f1(frame.x(b.x))}" y2="${f1(frame.y(b.y))}" stroke="${INK}" stroke-width="2.2"/>`);
  }
  for (const j of model.joints) {
    const p = after.get(j.id)!;
    out.push(`<circle cx="${f1(frame.x(p.x))}" cy="${f1(frame.y(p.y))}" r="2.4" fill="${INK}"/>`);
  }
  const most = model.joints.find((j) => j.tag === shape.maxTag);
  if (most && shape.maxMm > 0) {
    const p = after.get(most.id)!;
    out.push(`<circle cx="${f1(frame.x(p.x))}" cy="${f1(frame.y(p.y))}" r="6" fill="none" stroke="${INK}" stroke-width="1.4"/>`);
    out.push(haloText(frame.x(p.x) + 9, frame.y(p.y) + 18, `${most.tag}: ${options.maxText}`, `font-size="13" fill="${INK}" class="tnum"`));
  }
  const caption = shape.scale > 1 ? `Movements drawn ${shape.scale} × their size; the truss as drawn is dashed.` : 'Movements drawn true to size; the truss as drawn is dashed.';
  out.push(`<text x="${VIEW_W / 2}" y="${f1(frame.height - 14)}" text-anchor="middle" font-size="13" fill="${INK}">${svgEscape(caption)}</text>`);
  out.push('</svg>');
  return out.join('');
}
