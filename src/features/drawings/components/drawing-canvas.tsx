import { useCallback, useEffect, useLayoutEffect, useMemo, useRef, useState, type KeyboardEvent as ReactKeyboardEvent, type PointerEvent as ReactPointerEvent } from 'react';
import type { DxfImportResult, DxfPoint } from '@shared/dxf-import';
import { Button } from '@/components/ui/button';
import {
  cameraFit,
  cameraPan,
  cameraReveal,
  cameraToScreen,
  cameraToWorld,
  cameraZoomAt,
  type Camera,
  type ViewportSize,
} from '../utils/camera';
import type { DrawingHighlight } from '../utils/report-highlight';
import { formatScaleLength, scaleBarLength } from '../utils/scale-bar';

interface DrawingCanvasProps {
  result: DxfImportResult;
  /** Layer name → stroke colour. */
  colours: Map<string, string>;
  hiddenLayers: ReadonlySet<string>;
  highlight: DrawingHighlight | null;
  /** Changes whenever a report entry is chosen, so choosing the same one again pans back to it. */
  revealKey: number;
}

const HEIGHT = 480;
const WHEEL_STEP = 1.15;
const BUTTON_STEP = 1.5;
/** Screen pixels around the frame within which members and joints are still drawn. */
const VIEW_MARGIN = 24;
/** More tags than this in view overlap into a blur (and slow the page): they wait for a closer view. */
const MAX_TAGS = 600;
// Labels stay readable on paper: a halo of the ground colour behind each.
const LABEL_HALO = { paintOrder: 'stroke' as const, stroke: '#ffffff', strokeWidth: 3, strokeLinejoin: 'round' as const };

/**
 * The healed model drawn to scale as SVG, y up: pan by dragging, zoom with the wheel or the
 * buttons, "Fit" to see it all. Members take their layer's colour; a highlight from the report
 * draws halos at its places and accent strokes on its members, and the view pans to it.
 */
export function DrawingCanvas({ result, colours, hiddenLayers, highlight, revealKey }: DrawingCanvasProps) {
  const frameRef = useRef<HTMLDivElement>(null);
  const svgRef = useRef<SVGSVGElement>(null);
  const [size, setSize] = useState<ViewportSize | null>(null);
  const [camera, setCamera] = useState<Camera | null>(null);
  const [showJointTags, setShowJointTags] = useState(true);
  const [showMemberTags, setShowMemberTags] = useState(false);
  const [cursor, setCursor] = useState<DxfPoint | null>(null);
  const drag = useRef<{ id: number; x: number; y: number } | null>(null);

  const joints = useMemo(() => new Map(result.joints.map((j) => [j.id, j])), [result.joints]);

  useLayoutEffect(() => {
    const frame = frameRef.current;
    if (!frame) return;
    const measure = () => setSize({ width: Math.max(1, frame.clientWidth), height: HEIGHT });
    measure();
    const observer = new ResizeObserver(measure);
    observer.observe(frame);
    return () => observer.disconnect();
  }, []);

  const fit = useCallback(() => {
    if (size) setCamera(cameraFit(result.extent, size));
  }, [result.extent, size]);

  // A new model (another version, a re-import) starts fitted; so does the first measurement.
  const fittedFor = useRef<DxfImportResult | null>(null);
  useEffect(() => {
    if (size && fittedFor.current !== result) {
      fittedFor.current = result;
      setCamera(cameraFit(result.extent, size));
    }
  }, [result, size]);

  useEffect(() => {
    if (highlight && size) setCamera((c) => (c ? cameraReveal(c, size, highlight.box) : c));
    // Only a new choice pans; resizing the window must not yank the view back.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [revealKey, highlight]);

  // React's onWheel is passive; the page must not scroll while the drawing zooms.
  useEffect(() => {
    const svg = svgRef.current;
    if (!svg || !size) return;
    const onWheel = (event: WheelEvent) => {
      event.preventDefault();
      const rect = svg.getBoundingClientRect();
      const at = { x: event.clientX - rect.left, y: event.clientY - rect.top };
      const factor = event.deltaY < 0 ? WHEEL_STEP : 1 / WHEEL_STEP;
      setCamera((c) => (c ? cameraZoomAt(c, size, at, factor) : c));
    };
    svg.addEventListener('wheel', onWheel, { passive: false });
    return () => svg.removeEventListener('wheel', onWheel);
  }, [size]);

  const zoomCentre = (factor: number) => {
    if (size) setCamera((c) => (c ? cameraZoomAt(c, size, { x: size.width / 2, y: size.height / 2 }, factor) : c));
  };

  const localPoint = (event: ReactPointerEvent) => {
    const rect = svgRef.current!.getBoundingClientRect();
    return { x: event.clientX - rect.left, y: event.clientY - rect.top };
  };

  const onPointerDown = (event: ReactPointerEvent<SVGSVGElement>) => {
    if (event.button !== 0) return;
    event.currentTarget.setPointerCapture(event.pointerId);
    drag.current = { id: event.pointerId, x: event.clientX, y: event.clientY };
  };
  const onPointerMove = (event: ReactPointerEvent<SVGSVGElement>) => {
    if (camera && size) setCursor(cameraToWorld(camera, size, localPoint(event)));
    const d = drag.current;
    if (!d || d.id !== event.pointerId) return;
    const dx = event.clientX - d.x;
    const dy = event.clientY - d.y;
    drag.current = { ...d, x: event.clientX, y: event.clientY };
    setCamera((c) => (c ? cameraPan(c, dx, dy) : c));
  };
  const endDrag = (event: ReactPointerEvent<SVGSVGElement>) => {
    if (drag.current?.id === event.pointerId) drag.current = null;
  };

  const onKeyDown = (event: ReactKeyboardEvent) => {
    if (!size) return;
    const step = 40;
    const moves: Record<string, [number, number]> = { ArrowLeft: [step, 0], ArrowRight: [-step, 0], ArrowUp: [0, step], ArrowDown: [0, -step] };
    if (event.key in moves) {
      const [dx, dy] = moves[event.key]!;
      setCamera((c) => (c ? cameraPan(c, dx, dy) : c));
    } else if (event.key === '+' || event.key === '=') zoomCentre(BUTTON_STEP);
    else if (event.key === '-') zoomCentre(1 / BUTTON_STEP);
    else if (event.key === '0') fit();
    else return;
    event.preventDefault();
  };

  const ready = camera !== null && size !== null;
  const visibleMembers = useMemo(() => result.members.filter((m) => !hiddenLayers.has(m.layer)), [result.members, hiddenLayers]);
  const visibleJoints = useMemo(() => {
    const ids = new Set<string>();
    for (const m of visibleMembers) {
      ids.add(m.from);
      ids.add(m.to);
    }
    return result.joints.filter((j) => ids.has(j.id));
  }, [result.joints, visibleMembers]);
  const dim = highlight !== null;
  const bar = camera ? scaleBarLength(camera.scale) : null;

  // The geometry is drawn again only when the view or the model changes, not when the cursor
  // moves; what lies outside the frame is left out, and tags only when few enough to read.
  const drawn = useMemo(() => {
    if (!camera || !size) return null;
    const at = (p: DxfPoint) => cameraToScreen(camera, size, p);
    const m = VIEW_MARGIN;
    const pointIn = (p: DxfPoint) => p.x >= -m && p.y >= -m && p.x <= size.width + m && p.y <= size.height + m;
    const segmentIn = (p: DxfPoint, q: DxfPoint) =>
      Math.max(p.x, q.x) >= -m && Math.min(p.x, q.x) <= size.width + m && Math.max(p.y, q.y) >= -m && Math.min(p.y, q.y) <= size.height + m;
    const members: { id: string; tag: string; layer: string; p: DxfPoint; q: DxfPoint }[] = [];
    for (const member of visibleMembers) {
      const a = joints.get(member.from);
      const b = joints.get(member.to);
      if (!a || !b) continue;
      const p = at(a);
      const q = at(b);
      if (segmentIn(p, q)) members.push({ id: member.id, tag: member.tag, layer: member.layer, p, q });
    }
    const points: { id: string; tag: string; p: DxfPoint }[] = [];
    for (const joint of visibleJoints) {
      const p = at(joint);
      if (pointIn(p)) points.push({ id: joint.id, tag: joint.tag, p });
    }
    return { at, members, points, jointTagsFit: points.length <= MAX_TAGS, memberTagsFit: members.length <= MAX_TAGS };
  }, [camera, size, visibleMembers, visibleJoints, joints]);
  // the elements too, so that a cursor move does not rebuild thousands of them
  const memberLines = useMemo(
    () => drawn?.members.map(({ id, layer, p, q }) => <line key={id} x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke={colours.get(layer) ?? '#2b2d2f'} strokeWidth={1.75} />),
    [drawn, colours],
  );
  const jointDots = useMemo(
    () =>
      drawn?.points.map(({ id, p }) => (
        <circle key={id} cx={p.x} cy={p.y} r={2.75} fill="#ffffff" stroke="#2b2d2f" strokeWidth={1.25} opacity={dim && !highlight?.jointIds.has(id) ? 0.45 : 1} />
      )),
    [drawn, dim, highlight],
  );
  const tagsHidden = drawn !== null && ((showJointTags && !drawn.jointTagsFit) || (showMemberTags && !drawn.memberTagsFit));

  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
        <div className="flex items-center gap-4 text-xs text-ink-soft">
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" className="accent-accent" checked={showJointTags} onChange={(e) => setShowJointTags(e.target.checked)} />
            Joint labels
          </label>
          <label className="inline-flex items-center gap-1.5">
            <input type="checkbox" className="accent-accent" checked={showMemberTags} onChange={(e) => setShowMemberTags(e.target.checked)} />
            Member labels
          </label>
        </div>
        <div className="flex items-center gap-1">
          <Button size="sm" variant="secondary" onClick={() => zoomCentre(1 / BUTTON_STEP)} aria-label="Zoom out">
            −
          </Button>
          <Button size="sm" variant="secondary" onClick={() => zoomCentre(BUTTON_STEP)} aria-label="Zoom in">
            +
          </Button>
          <Button size="sm" variant="secondary" onClick={fit}>
            Fit
          </Button>
        </div>
      </div>

      <div ref={frameRef} className="relative overflow-hidden rounded-xs border border-paper-line bg-paper-raised" style={{ height: HEIGHT }}>
        <svg
          ref={svgRef}
          role="img"
          aria-label={`Truss drawing: ${result.joints.length} joints, ${result.members.length} members. Drag to pan, wheel to zoom.`}
          tabIndex={0}
          width={size?.width ?? '100%'}
          height={HEIGHT}
          className="block cursor-grab touch-none select-none active:cursor-grabbing focus-visible:outline-offset-[-2px]"
          onPointerDown={onPointerDown}
          onPointerMove={onPointerMove}
          onPointerUp={endDrag}
          onPointerCancel={endDrag}
          onPointerLeave={() => setCursor(null)}
          onKeyDown={onKeyDown}
        >
          <defs>
            <pattern id="drawing-grid" width="24" height="24" patternUnits="userSpaceOnUse">
              <path d="M24 0H0V24" fill="none" stroke="#f1ede5" strokeWidth="1" />
            </pattern>
          </defs>
          <rect width="100%" height="100%" fill="url(#drawing-grid)" />
          {ready && (
            <>
              <g strokeLinecap="round" opacity={dim ? 0.35 : 1}>
                {memberLines}
              </g>

              {highlight && (
                <g aria-hidden>
                  {visibleMembers
                    .filter((m) => highlight.memberIds.has(m.id))
                    .map((m) => {
                      const p = drawn!.at(joints.get(m.from)!);
                      const q = drawn!.at(joints.get(m.to)!);
                      return (
                        <g key={m.id}>
                          <line x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke="#d9ebe8" strokeWidth={11} strokeLinecap="round" />
                          <line x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke="#12605a" strokeWidth={3.5} strokeLinecap="round" />
                        </g>
                      );
                    })}
                </g>
              )}

              <g>{jointDots}</g>

              {highlight && (
                <g aria-hidden fill="none">
                  {[...highlight.jointIds].map((id) => {
                    const joint = joints.get(id);
                    if (!joint) return null;
                    const p = drawn!.at(joint);
                    return <circle key={id} cx={p.x} cy={p.y} r={10} fill="#12605a" fillOpacity={0.12} stroke="#12605a" strokeWidth={1.75} />;
                  })}
                  {highlight.points.map((point, i) => {
                    const p = drawn!.at(point);
                    return (
                      <g key={i}>
                        <circle cx={p.x} cy={p.y} r={13} stroke="#12605a" strokeWidth={1.5} strokeDasharray="4 3" />
                        <circle cx={p.x} cy={p.y} r={2} fill="#12605a" />
                      </g>
                    );
                  })}
                </g>
              )}

              {showMemberTags && drawn!.memberTagsFit && (
                <g fontSize={10} fill="#55585c" textAnchor="middle" dominantBaseline="central" style={LABEL_HALO}>
                  {drawn!.members.map(({ id, tag, p, q }) => (
                    <text key={id} x={(p.x + q.x) / 2} y={(p.y + q.y) / 2} fontStyle="italic">
                      {tag}
                    </text>
                  ))}
                </g>
              )}

              {showJointTags && drawn!.jointTagsFit && (
                <g fontSize={11} fontWeight={600} fill="#2b2d2f" style={LABEL_HALO}>
                  {drawn!.points.map(({ id, tag, p }) => (
                    <text key={id} x={p.x + 5} y={p.y - 6}>
                      {tag}
                    </text>
                  ))}
                </g>
              )}
            </>
          )}
        </svg>

        {tagsHidden && (
          <div className="pointer-events-none absolute top-2 left-3 rounded-xs bg-paper-raised/90 px-1.5 py-0.5 text-[11px] text-ink-soft">
            Labels show when {MAX_TAGS} or fewer are in view: zoom in to read them.
          </div>
        )}
        {bar && (
          <div className="pointer-events-none absolute bottom-2 left-3 flex flex-col items-start gap-0.5 text-[11px] text-ink-soft">
            <span className="figures">{formatScaleLength(bar.metres)}</span>
            <span className="block h-1.5 border-x border-b border-ink-soft" style={{ width: bar.pixels }} />
          </div>
        )}
        <div className="figures pointer-events-none absolute right-3 bottom-2 text-[11px] text-ink-faint">
          {cursor ? `x ${cursor.x.toFixed(3)} m · y ${cursor.y.toFixed(3)} m` : 'Drag to pan · wheel to zoom'}
        </div>
      </div>
    </div>
  );
}
