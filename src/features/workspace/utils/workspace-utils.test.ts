import { describe, expect, it } from 'vitest';
import type { Joint, Member } from '@shared/model/truss';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import { forceSense, forceStroke, forceText } from './force-format';
import { draftFromModelView, draftToSaveInput, loadCaseIdNext, modelDraftSchema } from './model-draft';
import { membersGroupByOutline } from './outline-groups';

// The demo truss T1 as its drawing gives it: 12 m span, 3 m rise, six 2 m panels.
const J = (id: string, tag: string, x: number, y: number): Joint => ({ id, tag, x, y });
const joints: Joint[] = [
  J('a', 'A', 6, 3), J('b', 'B', 4, 2), J('c', 'C', 8, 2), J('d', 'D', 2, 1), J('e', 'E', 10, 1),
  J('f', 'F', 0, 0), J('g', 'G', 2, 0), J('h', 'H', 4, 0), J('i', 'I', 6, 0), J('j', 'J', 8, 0), J('k', 'K', 10, 0), J('l', 'L', 12, 0),
];
const M = (from: string, to: string): Member => ({ id: `${from}${to}`, tag: `${from}${to}`.toUpperCase(), from, to });
const members: Member[] = [
  M('a', 'b'), M('a', 'c'), M('a', 'i'), M('b', 'd'), M('b', 'h'), M('b', 'i'), M('c', 'e'), M('c', 'i'), M('c', 'j'), M('d', 'f'), M('d', 'g'),
  M('d', 'h'), M('e', 'j'), M('e', 'k'), M('e', 'l'), M('f', 'g'), M('g', 'h'), M('h', 'i'), M('i', 'j'), M('j', 'k'), M('k', 'l'),
];

describe('membersGroupByOutline', () => {
  it('when the truss is the pitched demo truss, then the sloping outline is top chord, the level one bottom chord, the rest webs', () => {
    const groups = membersGroupByOutline(joints, members);
    // Read off the geometry by hand: F–D–B–A–C–E–L slope, F…L lie on y = 0.
    const tags = (g: string) => members.filter((m) => groups.get(m.id) === g).map((m) => m.tag).sort();
    expect(tags('top-chord')).toEqual(['AB', 'AC', 'BD', 'CE', 'DF', 'EL']);
    expect(tags('bottom-chord')).toEqual(['FG', 'GH', 'HI', 'IJ', 'JK', 'KL']);
    expect(tags('web')).toHaveLength(9);
  });

  it('when a parallel-chord truss has vertical end posts, then the posts are webs, not chords', () => {
    const pj = [J('p', 'P', 0, 0), J('q', 'Q', 3, 0), J('r', 'R', 0, 1), J('s', 'S', 3, 1)];
    const pm = [M('p', 'q'), M('r', 's'), M('p', 'r'), M('q', 's'), M('p', 's')];
    const groups = membersGroupByOutline(pj, pm);
    expect(groups.get('pq')).toBe('bottom-chord');
    expect(groups.get('rs')).toBe('top-chord');
    expect(groups.get('pr')).toBe('web');
    expect(groups.get('qs')).toBe('web');
    expect(groups.get('ps')).toBe('web');
  });
});

describe('model draft', () => {
  const view: TrussModelView = {
    trussId: 1,
    drawingId: 1,
    version: 4,
    updatedBy: 'x',
    updatedAt: '2026-01-01T00:00:00Z',
    takeoff: null,
    model: {
      joints,
      members: members.map((m) => (m.id === 'df' ? { ...m, group: 'top-chord', E: 11e6, A: 0.0084, material: 'C24' } : m)),
      supports: [{ joint: 'f', kind: 'pin' }, { joint: 'l', kind: 'roller', angleDeg: 90 }],
      loadCases: [{ id: 'D1', name: 'Dead', category: 'dead', loads: [{ joint: 'a', fx: 0, fy: -10 }] }],
      combinations: [{ name: 'C1', factors: { D1: 1.4 }, clause: 'ASCE/SEI 7-16 §2.3.1 (1)' }],
    },
  };

  it('when a saved model goes through the editor unchanged, then the save body gives back its values (E and A converted from GPa and mm²)', () => {
    const body = draftToSaveInput(modelDraftSchema.parse(draftFromModelView(view)), view.version);
    expect(body.version).toBe(4);
    expect(body.supports).toEqual(view.model.supports);
    expect(body.loadCases).toEqual(view.model.loadCases);
    expect(body.combinations).toEqual(view.model.combinations);
    const df = body.members.find((m) => m.id === 'df')!;
    // 11 GPa = 11 × 10⁶ kN/m²; 8400 mm² = 0.0084 m² (SI prefixes, BIPM SI Brochure, from memory).
    expect(df.E).toBeCloseTo(11e6, 3);
    expect(df.A).toBeCloseTo(0.0084, 12);
    expect(draftFromModelView(view).members.find((m) => m.id === 'df')!.A).toBe(8400);
  });

  it('when a load names a case that does not exist, then the draft is refused at that load', () => {
    const draft = draftFromModelView(view);
    draft.loads.push({ caseId: 'S9', joint: 'b', fx: 0, fy: -1 });
    const parsed = modelDraftSchema.safeParse(draft);
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(['loads', 1, 'caseId']);
    expect(parsed.error!.issues[0]!.message).toMatch(/S9/);
  });

  it('when two supports sit on one joint, then the second is refused', () => {
    const draft = draftFromModelView(view);
    draft.supports.push({ joint: 'f', kind: 'roller', angleDeg: 90 });
    const parsed = modelDraftSchema.safeParse(draft);
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues[0]!.path).toEqual(['supports', 2, 'joint']);
  });

  it('when a combination factor is zero, then it is left out of the save', () => {
    const draft = modelDraftSchema.parse(draftFromModelView(view));
    draft.combinations[0]!.factors = { D1: 0 };
    expect(draftToSaveInput(draft, 4).combinations[0]!.factors).toEqual({});
  });

  it('when ids D1 and D2 are taken, then the next dead case is D3 and the first snow case S1', () => {
    expect(loadCaseIdNext('dead', [{ id: 'D1' }, { id: 'D2' }])).toBe('D3');
    expect(loadCaseIdNext('snow', [{ id: 'D1' }])).toBe('S1');
  });
});

describe('force styles', () => {
  // docs/visual-language.md "Drawings": tension thin continuous, compression heavy continuous, zero faint dashed.
  it('when a force is tension, compression or zero, then it is a thin line, a heavy line or a faint dashed line', () => {
    const t = forceStroke(50, 100);
    const c = forceStroke(-1, 100);
    const z = forceStroke(1e-9, 100);
    expect([t.sense, t.dash]).toEqual(['T', undefined]);
    expect([c.sense, c.dash]).toEqual(['C', undefined]);
    expect(z.sense).toBe('0');
    expect(z.dash).toBeDefined();
    expect(new Set([t.colour, c.colour, z.colour]).size).toBe(3);
    expect(c.width).toBeGreaterThan(t.width);
    expect(z.width).toBeLessThan(t.width);
  });

  it('when a project is in US units, then 4.448 kN reads as 1.00 kip (1 kip = 4.448 222 kN, NIST SP 811 Appendix B)', () => {
    expect(forceText(4.4482216, 'us')).toBe('1.00\u202fkip');
    expect(forceText(-33.5, 'si')).toBe('\u221233.50\u202fkN');
    expect(forceSense(-33.5)).toBe('C');
  });
});
