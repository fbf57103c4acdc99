import type { DxfExtent, DxfImportResult, DxfPoint, DxfReportEntry } from '@shared/dxf-import';
import { boxOfPoints } from './camera';

/** What the drawing marks for a selected report entry: halos at points and joints, accent strokes on members. */
export interface DrawingHighlight {
  /** Places in metres (a crossing, a dropped segment) that have no joint of their own. */
  points: DxfPoint[];
  jointIds: Set<string>;
  memberIds: Set<string>;
  /** Everything highlighted, metres: where the view pans to. */
  box: DxfExtent;
}

/** True when the entry names any place to show (some entries only say what was read). */
export function reportEntryHasPlaces(entry: DxfReportEntry): boolean {
  return entry.points.length > 0 || entry.joints.length > 0 || entry.members.length > 0;
}

/**
 * Maps one report entry onto the model it came with: its points as given, its joint and
 * member ids as far as the model holds them (ids of another import are skipped), and the box
 * around all of it, members counted by both end joints. Null when nothing is left to show.
 */
export function reportEntryHighlight(entry: DxfReportEntry, result: Pick<DxfImportResult, 'joints' | 'members'>): DrawingHighlight | null {
  const jointsById = new Map(result.joints.map((j) => [j.id, j]));
  const membersById = new Map(result.members.map((m) => [m.id, m]));

  const points = entry.points.filter((p) => Number.isFinite(p.x) && Number.isFinite(p.y));
  const jointIds = new Set(entry.joints.filter((id) => jointsById.has(id)));
  const memberIds = new Set(entry.members.filter((id) => membersById.has(id)));

  const places: DxfPoint[] = [...points];
  for (const id of jointIds) places.push(jointsById.get(id)!);
  for (const id of memberIds) {
    const member = membersById.get(id)!;
    for (const end of [member.from, member.to]) {
      const joint = jointsById.get(end);
      if (joint) places.push(joint);
    }
  }
  const box = boxOfPoints(places);
  if (!box) return null;
  return { points, jointIds, memberIds, box };
}
