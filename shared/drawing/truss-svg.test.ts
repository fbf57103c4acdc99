import { describe, expect, it } from 'vitest';
import { trussSolve, type JointStep } from '../solver';
import { modelFromSketch } from '../solver/test-trusses';
import { DRAWING_INK, jointFbdSvg, LOAD_STYLE, REACTION_STYLE, subscriptText } from './truss-svg';

/**
 * A symmetric triangle of our own: A (0, 0) pin, B (4, 0) roller, apex C (2, 1.5), 10 kN down at
 * C and 3 kN down at A. By hand (method of joints, 3-4-5 slopes: sin θ = 0.6, cos θ = 0.8; from
 * memory): R_A,y = 5 + 3 = 8 kN, R_B,y = 5 kN; rafters F = 5 / 0.6 = 8.33 kN (C); tie
 * F_AB = 8.333 × 0.8 = 6.67 kN (T).
 */
const model = modelFromSketch({
  joints: [['A', 0, 0], ['B', 4, 0], ['C', 2, 1.5]],
  members: [['A', 'B'], ['B', 'C'], ['C', 'A']],
  supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
  cases: [{ id: 'D', loads: [['C', 0, -10], ['A', 0, -3]] }],
});
const steps: JointStep[] = trussSolve(model).cases[0].jointSteps;
const kn = (v: number) => `${v.toFixed(2)} kN`;
const draw = (s: JointStep) => jointFbdSvg(s, { formatForce: kn, zeroTolerance: 1e-9 });
const text = (svg: string) => svg.replace(/<[^>]+>/g, '');
const attrs = (svg: string, tag: string, pick: (a: string) => boolean) =>
  [...svg.matchAll(new RegExp(`<${tag} ([^>]*?)/?>`, 'g'))].map((m) => m[1]).filter(pick);
const num = (a: string, name: string) => Number(new RegExp(`\\b${name}="([-\\d.]+)"`).exec(a)![1]);

describe('joint free-body diagram', () => {
  it('when a joint is drawn, then every label is a typeset symbol (F, R, P with a lowered subscript), never "R_A,y"', () => {
    for (const s of steps) {
      const svg = draw(s);
      expect(text(svg)).not.toMatch(/_/);
      expect(svg).toMatch(/>F<tspan dy="[\d.]+" font-size="[\d.]+">[ABC]{2}<\/tspan>/);
    }
  });

  it('when the later joint steps know the first forces, then they print the hand values with their sense', () => {
    const all = steps.map((s) => text(draw(s))).join(' ');
    expect(all).toContain('RA,y = 8.00 kN');
    // Some step knows at least one of the members solved before it, as found by hand.
    expect(all).toMatch(/F(CA|BC) = 8\.33 kN \(C\)|FAB = 6\.67 kN \(T\)/);
  });

  it('when a load and a reaction act on one line at a joint, then they are drawn side by side in different styles and both labelled', () => {
    const a = steps.find((s) => s.jointTag === 'A')!;
    const svg = draw(a);
    expect(text(svg)).toContain('PA,y = 3.00 kN');
    expect(text(svg)).toContain('RA,y = 8.00 kN');
    const loadLine = attrs(svg, 'line', (x) => x.includes(`stroke="${LOAD_STYLE.stroke}"`) && !x.includes('y1="237"'))[0];
    const reactionLine = attrs(svg, 'line', (x) => x.includes(`stroke="${REACTION_STYLE.stroke}"`) && x.includes('stroke-dasharray') && num(x, 'x1') === num(x, 'x2'))[0];
    // Both vertical; the reaction beside the load, not on its line.
    expect(num(loadLine, 'x1')).toBeCloseTo(num(loadLine, 'x2'), 6);
    expect(Math.abs(num(reactionLine, 'x1') - num(loadLine, 'x1'))).toBeGreaterThanOrEqual(10);
    // The load's head is filled; the reaction's is open (white with a violet outline).
    expect(svg).toMatch(new RegExp(`<path d="[^"]+" fill="${LOAD_STYLE.stroke}"/>`));
    expect(svg).toMatch(new RegExp(`<path d="[^"]+" fill="${DRAWING_INK.paper}" stroke="${REACTION_STYLE.stroke}"`));
    // And the key says which is which.
    expect(text(svg)).toMatch(/load.*reaction/);
  });

  it('when a label has no subscript or a tag with a space, then it is typeset up to " = " only', () => {
    expect(subscriptText('R_Joint 4,y = 2.00 kN', 12)).toMatch(/>Joint 4,y<\/tspan><tspan dy="-[\d.]+"> = 2\.00 kN</);
    expect(subscriptText('C', 12)).toBe('C');
  });
});
