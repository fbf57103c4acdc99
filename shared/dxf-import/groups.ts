import type { Joint, Member, MemberGroup } from '@shared/model/truss';
import { membersGroupByOutline } from '@shared/model/outline-groups';

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

/**
 * Member groups for an imported drawing: from the layer names where they say (rules above),
 * with the outline choosing top or bottom for a layer that only says "chord" (along the upper
 * edge of the outline: top chord; otherwise bottom chord); from the outline
 * (lower edge bottom chord, upper edge top chord, the rest webs) for the other members.
 */
export function memberGroupsSuggest(
  joints: readonly Joint[],
  members: readonly (Member & { layer: string })[],
): { groups: Map<string, MemberGroup>; source: Map<string, GroupSource>; hints: Map<string, LayerGroupHint> } {
  const hints = new Map<string, LayerGroupHint>();
  for (const m of members) if (!hints.has(m.layer)) hints.set(m.layer, layerGroupHint(m.layer));
  const outline = membersGroupByOutline(joints, members);
  const groups = new Map<string, MemberGroup>();
  const source = new Map<string, GroupSource>();
  for (const m of members) {
    const hint = hints.get(m.layer) ?? null;
    const fromOutline = outline.get(m.id);
    if (hint === 'top-chord' || hint === 'bottom-chord' || hint === 'web') {
      groups.set(m.id, hint);
      source.set(m.id, 'layer');
    } else if (hint === 'chord') {
      // A chord along the upper edge of the outline is the top chord; any other chord is the
      // bottom chord (also a scissor truss's raised one, which the outline alone calls a web).
      groups.set(m.id, fromOutline === 'top-chord' ? 'top-chord' : 'bottom-chord');
      source.set(m.id, 'layer-and-outline');
    } else if (fromOutline) {
      groups.set(m.id, fromOutline);
      source.set(m.id, 'outline');
    }
  }
  return { groups, source, hints };
}
