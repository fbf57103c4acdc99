import { useLayoutEffect, useMemo, useRef, useState, type ReactNode } from 'react';
import type { Joint, Member, Support } from '@shared/model/truss';
import { fitPoints, type Fit } from '../utils/fit';

/** A force arrow drawn at a joint: a load (head at the joint) or a reaction (head at the joint, from outside). */
export interface JointArrow {
  joint: string;
  /** kN; only the direction and whether it is zero matter for drawing. */
  fx: number;
  fy: number;
  label: string;
  tone: 'load' | 'reaction';
}

export interface MemberLook {
  colour: string;
  width: number;
  dash?: string;
}

interface TrussSvgProps {
  joints: readonly Joint[];
  members: readonly Member[];
  supports?: readonly Support[];
  arrows?: readonly JointArrow[];
  height?: number;
  /** How each member is drawn; graphite lines by default. */
  memberLook?: (member: Member) => MemberLook;
  memberLabel?: (member: Member) => string | null;
  selectedMembers?: ReadonlySet<string>;
  onMemberClick?: (member: Member) => void;
  /** Joints drawn with an accent halo (a step's joint, a mechanism). */
  highlightJoints?: ReadonlySet<string>;
  /** 'danger' halos for the joints of a mechanism. */
  highlightTone?: 'accent' | 'danger';
  /** Joints marked with a purlin symbol. */
  purlinJoints?: ReadonlySet<string>;
  /** Joints that may be clicked; all when onJointClick is given and this is left out. */
  clickableJoints?: ReadonlySet<string>;
  onJointClick?: (joint: Joint, at: { x: number; y: number }) => void;
  onJointHover?: (joint: Joint | null) => void;
  label: string;
  /** Drawn over the SVG (a popover), given the fit so it can place itself at a joint. */
  overlay?: (fit: Fit, size: { width: number; height: number }) => ReactNode;
}

const INK = '#2b2d2f';
const ACCENT = '#12605a';
const DANGER = '#a33a2b';
const HALO = { paintOrder: 'stroke' as const, stroke: '#ffffff', strokeWidth: 3.5, strokeLinejoin: 'round' as const };
const ARROW_LENGTH = 38;

function SupportGlyph({ support, at, faint }: { support: Support; at: { x: number; y: number }; faint: boolean }) {
  // Drawn pointing up at the joint, then turned so the reaction line runs at the roller's angle.
  const angle = support.kind === 'roller' ? support.angleDeg ?? 90 : 90;
  const turn = 90 - angle;
  const stroke = faint ? '#8a8d90' : INK;
  return (
    <g transform={`translate(${at.x} ${at.y}) rotate(${turn})`} fill="none" stroke={stroke} strokeWidth={1.4} aria-hidden>
      <path d="M0 3 L-9 17 L9 17 Z" fill="#fbf8f3" />
      {support.kind === 'pin' ? (
        <g strokeWidth={1}>
          <line x1={-13} y1={17} x2={13} y2={17} />
          {[-10, -4, 2, 8].map((x) => (
            <line key={x} x1={x} y1={17} x2={x - 4} y2={22} />
          ))}
        </g>
      ) : (
        <g>
          <circle cx={-5} cy={20.5} r={3} fill="#fbf8f3" />
          <circle cx={5} cy={20.5} r={3} fill="#fbf8f3" />
          <line x1={-13} y1={24.5} x2={13} y2={24.5} strokeWidth={1} />
        </g>
      )}
    </g>
  );
}

function Arrow({ arrow, at }: { arrow: JointArrow; at: { x: number; y: number } }) {
  const len = Math.hypot(arrow.fx, arrow.fy);
  if (len === 0) return null;
  // Screen direction of the force (y flipped); the head sits just off the joint.
  const ux = arrow.fx / len;
  const uy = -arrow.fy / len;
  const gap = arrow.tone === 'reaction' ? 30 : 5;
  const hx = at.x - ux * gap;
  const hy = at.y - uy * gap;
  const tx = hx - ux * ARROW_LENGTH;
  const ty = hy - uy * ARROW_LENGTH;
  const colour = arrow.tone === 'reaction' ? ACCENT : INK;
  const head = `M${hx} ${hy} L${hx - ux * 8 - uy * 4} ${hy - uy * 8 + ux * 4} L${hx - ux * 8 + uy * 4} ${hy - uy * 8 - ux * 4} Z`;
  return (
    <g>
      <line x1={tx} y1={ty} x2={hx - ux * 6} y2={hy - uy * 6} stroke={colour} strokeWidth={1.6} />
      {/* Told apart by shape as well as colour: a load's head is filled, a reaction's open. */}
      <path d={head} fill={arrow.tone === 'reaction' ? 'none' : colour} stroke={colour} strokeWidth={arrow.tone === 'reaction' ? 1.4 : 0} strokeLinejoin="miter" />
      <text
        x={tx - ux * 4}
        y={ty - uy * 4 + (Math.abs(uy) > 0.5 ? (uy > 0 ? -4 : 12) : 4)}
        textAnchor={Math.abs(ux) > 0.5 ? (ux > 0 ? 'end' : 'start') : 'middle'}
        fontSize={11}
        fill={colour}
        className="figures"
        style={HALO}
      >
        {arrow.label}
      </text>
    </g>
  );
}

/**
 * The truss drawn to fit its box (y up), for the workspace: supports, load and reaction arrows,
 * member looks and labels, selectable members and clickable joints (keyboard reachable).
 */
export function TrussSvg({
  joints,
  members,
  supports = [],
  arrows = [],
  height = 380,
  memberLook,
  memberLabel,
  selectedMembers,
  onMemberClick,
  highlightJoints,
  highlightTone = 'accent',
  purlinJoints,
  clickableJoints,
  onJointClick,
  onJointHover,
  label,
  overlay,
}: TrussSvgProps) {
  const frameRef = useRef<HTMLDivElement>(null);
  const [width, setWidth] = useState(0);
  useLayoutEffect(() => {
    const frame = frameRef.current;
    if (!frame) return;
    const measure = () => setWidth(Math.max(1, frame.clientWidth));
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(frame);
    return () => observer.disconnect();
  }, []);

  const byId = useMemo(() => new Map(joints.map((j) => [j.id, j])), [joints]);
  const fit = useMemo(() => fitPoints(joints, width || 600, height, 64), [joints, width, height]);
  const at = fit.toScreen;
  const haloColour = highlightTone === 'danger' ? DANGER : ACCENT;

  return (
    <div ref={frameRef} className="relative overflow-hidden rounded-xs border border-paper-line bg-paper-raised" style={{ height }}>
      {width > 0 && (
        <svg width={width} height={height} role="group" aria-label={label} className="block select-none">
          <defs>
            <pattern id="workspace-grid" width="24" height="24" patternUnits="userSpaceOnUse">
              <path d="M24 0H0V24" fill="none" stroke="#f4f1ea" strokeWidth="1" />
            </pattern>
          </defs>
          <rect width="100%" height="100%" fill="url(#workspace-grid)" />

          {supports.map((s) => {
            const j = byId.get(s.joint);
            return j ? <SupportGlyph key={s.joint} support={s} at={at(j)} faint={arrows.some((a) => a.tone === 'reaction')} /> : null;
          })}

          <g strokeLinecap="round">
            {members.map((m) => {
              const a = byId.get(m.from);
              const b = byId.get(m.to);
              if (!a || !b) return null;
              const p = at(a);
              const q = at(b);
              const look = memberLook?.(m) ?? { colour: INK, width: 1.75 };
              const selected = selectedMembers?.has(m.id) ?? false;
              return (
                <g key={m.id}>
                  {selected && <line x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke="#d9ebe8" strokeWidth={12} />}
                  <line x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke={selected ? ACCENT : look.colour} strokeWidth={selected ? Math.max(3, look.width) : look.width} strokeDasharray={look.dash} />
                  {onMemberClick && (
                    <line
                      x1={p.x}
                      y1={p.y}
                      x2={q.x}
                      y2={q.y}
                      stroke="transparent"
                      strokeWidth={14}
                      className="cursor-pointer"
                      role="button"
                      tabIndex={0}
                      aria-pressed={selected}
                      aria-label={`Member ${m.tag}`}
                      onClick={() => onMemberClick(m)}
                      onKeyDown={(e) => {
                        if (e.key === 'Enter' || e.key === ' ') {
                          e.preventDefault();
                          onMemberClick(m);
                        }
                      }}
                    />
                  )}
                </g>
              );
            })}
          </g>

          {memberLabel && (
            <g fontSize={11} textAnchor="middle" dominantBaseline="central" style={HALO} className="figures" pointerEvents="none">
              {members.map((m) => {
                const text = memberLabel(m);
                const a = byId.get(m.from);
                const b = byId.get(m.to);
                if (!text || !a || !b) return null;
                const p = at(a);
                const q = at(b);
                const len = Math.hypot(q.x - p.x, q.y - p.y) || 1;
                // Off the line on its upper/left side, so the line stays visible.
                let nx = -(q.y - p.y) / len;
                let ny = (q.x - p.x) / len;
                if (ny > 0 || (ny === 0 && nx > 0)) {
                  nx = -nx;
                  ny = -ny;
                }
                const look = memberLook?.(m);
                return (
                  <text key={m.id} x={(p.x + q.x) / 2 + nx * 10} y={(p.y + q.y) / 2 + ny * 10} fill={look?.colour && look.colour !== INK ? look.colour : '#55585c'} fontWeight={500}>
                    {text}
                  </text>
                );
              })}
            </g>
          )}

          {arrows.map((arrow, i) => {
            const j = byId.get(arrow.joint);
            return j ? <Arrow key={`${arrow.joint}-${arrow.tone}-${i}`} arrow={arrow} at={at(j)} /> : null;
          })}

          {highlightJoints && (
            <g aria-hidden>
              {[...highlightJoints].map((id) => {
                const j = byId.get(id);
                if (!j) return null;
                const p = at(j);
                return <circle key={id} cx={p.x} cy={p.y} r={12} fill={haloColour} fillOpacity={0.14} stroke={haloColour} strokeWidth={2} />;
              })}
            </g>
          )}

          {purlinJoints && (
            <g aria-hidden>
              {[...purlinJoints].map((id) => {
                const j = byId.get(id);
                if (!j) return null;
                const p = at(j);
                return <rect key={id} x={p.x - 5} y={p.y - 13} width={10} height={7} fill={ACCENT} rx={1} />;
              })}
            </g>
          )}

          <g>
            {joints.map((j) => {
              const p = at(j);
              const clickable = onJointClick && (!clickableJoints || clickableJoints.has(j.id));
              return (
                <g
                  key={j.id}
                  role={clickable ? 'button' : undefined}
                  tabIndex={clickable ? 0 : undefined}
                  aria-label={clickable ? `Joint ${j.tag} at (${j.x.toFixed(3)}, ${j.y.toFixed(3)}) m` : undefined}
                  className={clickable ? 'cursor-pointer focus:outline-none [&:focus>circle:first-child]:stroke-accent' : undefined}
                  onClick={clickable ? () => onJointClick!(j, p) : undefined}
                  onKeyDown={
                    clickable
                      ? (e) => {
                          if (e.key === 'Enter' || e.key === ' ') {
                            e.preventDefault();
                            onJointClick!(j, p);
                          }
                        }
                      : undefined
                  }
                  onMouseEnter={onJointHover ? () => onJointHover(j) : undefined}
                  onMouseLeave={onJointHover ? () => onJointHover(null) : undefined}
                >
                  {clickable && <circle cx={p.x} cy={p.y} r={11} fill="transparent" stroke="transparent" strokeWidth={2} />}
                  <circle cx={p.x} cy={p.y} r={3.25} fill="#ffffff" stroke={INK} strokeWidth={1.4} />
                  <text x={p.x + 6} y={p.y - 7} fontSize={11.5} fontWeight={600} fill={INK} style={HALO}>
                    {j.tag}
                  </text>
                </g>
              );
            })}
          </g>
        </svg>
      )}
      {width > 0 && overlay?.(fit, { width, height })}
    </div>
  );
}
