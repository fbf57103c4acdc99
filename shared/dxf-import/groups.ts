import type { Joint, Member, MemberGroup } from '@shared/model/truss';
import { OUTLINE_BOTTOM, OUTLINE_TOP, OUTLINE_WEB, outlineGroupCodes } from '@shared/model/outline-groups';

/**
 * What a layer's name says about the members drawn on it: a chord (top or bottom, or either),
 * the webs, or nothing.
 */
export type LayerGroupHint = 'top-chord' | 'bottom-chord' | 'chord' | 'web' | null;

/*
 * The layer-name rules, written down (common drafting practice, no source):
 *
 * 1. The name is cut into words at anything that is not a letter or digit ("TRUSS-TC",
 *    "Top chord", "s_webs_2"), case ignored; digits ending a word are dropped ("VERT2" → VERT).
 * 2. A word names
 *      the top chord:     TOP, TC, UPPER, TOPCHORD(S), UPPERCHORD(S), TCHORD
 *      the bottom chord:  BOTTOM, BOT, BTM, BC, LOWER, BOTTOMCHORD(S), LOWERCHORD(S), BCHORD
 *      the webs:          WEB(S), DIAG(S), DIAGONAL(S), VERT(S), VERTICAL(S), POST(S), STRUT(S)
 *      a chord, either:   CHORD(S)
 * 3. Top words win over CHORD ("TOP CHORD" is the top chord); a name with both top and bottom
 *    words is a chord of either side ("TC+BC"); a name with web words and chord words, or
 *    with none of these words, says nothing, and the outline decides.
 */
const TOP = /^(TOP|TC|UPPER|TOPCHORDS?|UPPERCHORDS?|TCHORD)$/;
const BOTTOM = /^(BOTTOM|BOT|BTM|BC|LOWER|BOTTOMCHORDS?|LOWERCHORDS?|BCHORD)$/;
const WEB = /^(WEBS?|DIAGS?|DIAGONALS?|VERTS?|VERTICALS?|POSTS?|STRUTS?)$/;
const CHORD = /^CHORDS?$/;

/** The group a layer's name suggests, by the rules above. */
export function layerGroupHint(layerName: string): LayerGroupHint {
  const words = layerName
    .toUpperCase()
    .split(/[^A-Z0-9]+/)
    .map((w) => w.replace(/\d+$/, ''))
    .filter(Boolean);
  const top = words.some((w) => TOP.test(w));
  const bottom = words.some((w) => BOTTOM.test(w));
  const web = words.some((w) => WEB.test(w));
  const chord = words.some((w) => CHORD.test(w));
  if (web) return top || bottom || chord ? null : 'web';
  if (top && bottom) return 'chord';
  if (top) return 'top-chord';
  if (bottom) return 'bottom-chord';
  if (chord) return 'chord';
  return null;
}

/** Where an import's suggested group of a member came from. */
export type GroupSource = 'layer' | 'layer-and-outline' | 'outline';

const CODE_GROUP: MemberGroup[] = ['other', 'top-chord', 'bottom-chord', 'web'];
const SOURCE_OF: GroupSource[] = ['outline', 'layer', 'layer-and-outline'];

/**
 * Member groups for an imported drawing: from the layer names where they say (rules above),
 * with the outline choosing top or bottom for a layer that only says "chord" (along the upper
 * edge of the outline: top chord; otherwise bottom chord); from the outline (lower edge bottom
 * chord, upper edge top chord, the rest webs) for the other members. On columns (joint
 * coordinates, member ends as joint indices, member layer indices): a group code per member
 * (1 top chord, 2 bottom chord, 3 web) and where it came from (0 outline, 1 layer, 2 layer and outline).
 */
export function memberGroupCodes(xy: Float64Array, ends: Int32Array, memberLayer: Int32Array, layerNames: readonly string[]): { codes: Uint8Array; source: Uint8Array; hints: LayerGroupHint[] } {
  const hints = layerNames.map(layerGroupHint);
  const codes = outlineGroupCodes(xy, ends);
  const source = new Uint8Array(codes.length);
  for (let i = 0; i < codes.length; i++) {
    const hint = hints[memberLayer[i]!];
    if (hint === 'top-chord') codes[i] = OUTLINE_TOP;
    else if (hint === 'bottom-chord') codes[i] = OUTLINE_BOTTOM;
    else if (hint === 'web') codes[i] = OUTLINE_WEB;
    else if (hint === 'chord') {
      // A chord along the upper edge of the outline is the top chord; any other chord is the
      // bottom chord (also a scissor truss's raised one, which the outline alone calls a web).
      codes[i] = codes[i] === OUTLINE_TOP ? OUTLINE_TOP : OUTLINE_BOTTOM;
      source[i] = 2;
      continue;
    } else continue;
    source[i] = 1;
  }
  return { codes, source, hints };
}

/** {@link memberGroupCodes} on the model's objects (members carrying their layer). */
export function memberGroupsSuggest(
  joints: readonly Joint[],
  members: readonly (Member & { layer: string })[],
): { groups: Map<string, MemberGroup>; source: Map<string, GroupSource>; hints: Map<string, LayerGroupHint> } {
  const index = new Map<string, number>();
  const xy = new Float64Array(2 * joints.length);
  joints.forEach((j, k) => {
    index.set(j.id, k);
    xy[2 * k] = j.x;
    xy[2 * k + 1] = j.y;
  });
  const known = members.filter((m) => index.has(m.from) && index.has(m.to));
  const layerNames: string[] = [];
  const layerIndex = new Map<string, number>();
  const ends = new Int32Array(2 * known.length);
  const memberLayer = new Int32Array(known.length);
  known.forEach((m, i) => {
    ends[2 * i] = index.get(m.from)!;
    ends[2 * i + 1] = index.get(m.to)!;
    let li = layerIndex.get(m.layer);
    if (li === undefined) {
      li = layerNames.length;
      layerNames.push(m.layer);
      layerIndex.set(m.layer, li);
    }
    memberLayer[i] = li;
  });
  const { codes, source, hints } = memberGroupCodes(xy, ends, memberLayer, layerNames);
  const groups = new Map<string, MemberGroup>();
  const sources = new Map<string, GroupSource>();
  known.forEach((m, i) => {
    groups.set(m.id, CODE_GROUP[codes[i]!]!);
    sources.set(m.id, SOURCE_OF[source[i]!]!);
  });
  return { groups, source: sources, hints: new Map(layerNames.map((l, li) => [l, hints[li]!])) };
}
