import type { TrussModel } from '@shared/model/truss';
import { loadLetterOf, symbolLoad, symbolMember, symbolReaction, type TrussAnalysis } from '@shared/solver';
import { texText } from '@shared/text/safe-text';
import { katexHtml } from './format';
import type { SheetSection } from './context';
import type { CalcSheetInput, DesignBasisSymbol } from './types';
import type { TakeoffStep } from '@shared/takeoff';
import { DESIGN_CAUTION } from './design-checks';

const CAUTION =
  'These results are an aid to design and must be reviewed by a licensed professional engineer before they are used. ' +
  'Local building codes and the authority having jurisdiction govern; where they differ from the design basis stated here, they take precedence. ' +
  'The analysis assumes a plane, pin-jointed truss with loads applied at the joints, linear elastic behaviour and small displacements.';

/** The project's design basis, the clauses its combinations cite, the method and the caution. */
export const designBasisSection: SheetSection<'caution' | 'designBasis'> = {
  build({ input, model, analysis }) {
    const clauses = [...new Set(model.combinations.map((c) => c.clause).filter((c): c is string => !!c))];
    return {
      view: {
        caution: input.design ? `${CAUTION} ${DESIGN_CAUTION}` : CAUTION,
        designBasis: {
          paragraphs: (input.project.designBasis ?? '').split(/\n\s*\n/).map((p) => p.trim()).filter(Boolean),
          clauses,
          method: methodLines(input, analysis),
          symbols: symbolsOf(model, analysis, input.takeoffSteps ?? []),
        },
      },
      contents: [{ anchor: 'design-basis', title: 'Design basis and caution' }],
    };
  },
};

/**
 * The method lines describe what this sheet actually does: the methods its cases were solved
 * by (not a general claim), how the roof loads were taken off, and how its numbers are printed.
 */
function methodLines(input: CalcSheetInput, analysis: TrussAnalysis): string[] {
  const lines = [
    'Plane truss, members pin-jointed at both ends, loads at the joints; member forces are axial, tension positive and marked (T), compression negative and marked (C).',
    'Stability and determinacy by the count m + r against 2j and by the rank of the joint-equilibrium matrix.',
  ];
  if (input.takeoffSteps?.length) {
    const reaction = input.takeoffSteps.find((s) => s.kind === 'purlin-reaction');
    const chosen = reaction?.kind === 'purlin-reaction' ? reaction.chosen : 'exact';
    lines.push(
      chosen === 'exact'
        ? 'Roof loads from area loads through purlins: tributary widths between purlins; each purlin a continuous beam over the trusses, its reaction on this truss by the three-moment equation (by tributary length shown beside it for comparison).'
        : 'Roof loads from area loads through purlins: tributary widths between purlins; each purlin’s reaction on this truss by tributary length (half of each adjacent span), the three-moment equation shown beside it for comparison.',
    );
    if (input.takeoffSteps.some((s) => s.kind === 'span-pattern')) {
      lines.push(
        'Partial loading of the continuous purlins (ASCE/SEI 7-16 4.3.3, 7.5): for the cases so marked, the pattern of loaded and empty spans that gives this truss its largest reaction, found over every pattern by superposition of single-span reactions; empty spans carry no load (at least the reaction with half the balanced snow load on them).',
      );
    }
    if (input.takeoffSteps.some((s) => s.kind === 'wind-purlin')) {
      lines.push('Wind normal to the roof: velocity pressure times each slope’s pressure coefficient on the sloped area, resolved into x and y at each purlin and carried to this truss like the other purlin loads.');
    }
  }
  const methods = new Set(analysis.cases.map((c) => c.method));
  if (analysis.cases.some((c) => c.zeroForce.length)) lines.push('Zero-force members by the two joint rules, repeated until nothing changes.');
  if (methods.has('stiffness')) {
    lines.push('Member forces by the direct stiffness method with each member’s EA (the truss is statically indeterminate); reactions from the equilibrium of the supported joints.');
  }
  if (methods.has('joints') || methods.has('joints-and-simultaneous')) {
    const atJoints = analysis.cases.some((c) => c.reactionNote);
    lines.push(
      atJoints
        ? 'Support reactions found with the member forces at the joints (global equilibrium alone cannot give them all).'
        : 'Support reactions from global equilibrium: moments about a support, then the sums of forces.',
    );
  }
  if (methods.has('joints')) lines.push('Member forces by the method of joints, joint by joint, each joint with at most two unknowns.');
  if (methods.has('joints-and-simultaneous')) {
    const simultaneous = analysis.cases.filter((c) => c.method === 'joints-and-simultaneous');
    const most = Math.max(0, ...simultaneous.flatMap((c) => c.simultaneousSteps.map((s) => s.unknowns.length)));
    const jointByJoint = simultaneous.some((c) => c.jointSteps.length > 0);
    lines.push(
      jointByJoint
        ? `Member forces by the method of joints while a joint has at most two unknowns; where none is left, the remaining unknowns (up to ${most} here) are solved together from the equilibrium equations of those joints, printed in full.`
        : `No joint has two or fewer unknowns, so the member forces (${most} unknowns) are solved together from the equilibrium equations of all the joints, printed in full.`,
    );
  }
  lines.push(
    'Results are printed to three decimals (kN, m). The numbers a step is worked from (cosines, lever arms, forces carried from earlier steps) are printed to as many more places as needed for the step, redone by hand from the printed numbers, to give the printed result.',
    'Every result is checked by an independent residual of equilibrium at every joint.',
  );
  return lines;
}

/**
 * The symbols list of the design basis: every symbol the steps of this sheet write, shown with a
 * tag of this truss, and what it stands for, so each is defined before its first use (the design
 * basis comes before every step). Only symbols the sheet uses are listed.
 */
function symbolsOf(model: TrussModel, analysis: TrussAnalysis, takeoffSteps: readonly TakeoffStep[]): DesignBasisSymbol[] {
  const out: Omit<DesignBasisSymbol, 'html'>[] = [];
  const add = (tex: string, meaning: string) => out.push({ tex, meaning });
  const member = model.members[0];
  if (member) add(symbolMember(member.tag), `axial force in member ${member.tag} (each member by its tag); tension positive, marked (T), compression negative, marked (C)`);
  const pin = model.supports.find((s) => s.kind === 'pin');
  const roller = model.supports.find((s) => s.kind === 'roller');
  const tagOf = (id: string) => model.joints.find((j) => j.id === id)?.tag ?? id;
  if (pin) {
    const t = tagOf(pin.joint);
    add(`${symbolReaction(t, 'x')},\\ ${symbolReaction(t, 'y')}`, `reaction of the support at joint ${t} along x and along y, positive toward +x and +y (y up)`);
  }
  if (roller) {
    const t = tagOf(roller.joint);
    const norm = (((roller.kind === 'roller' ? roller.angleDeg : 90) % 180) + 180) % 180;
    const shown = norm === 90 ? 'y' : norm === 0 ? 'x' : 'n';
    add(symbolReaction(t, shown), shown === 'n' ? `reaction of the roller at joint ${t}, along its reaction line (normal to its rolling surface)` : `reaction of the roller at joint ${t}, along ${shown} (its reaction line)`);
  }
  const loaded = model.loadCases.flatMap((c) => c.loads).find((l) => Math.hypot(l.fx, l.fy) > 0);
  if (loaded) {
    const t = tagOf(loaded.joint);
    const letter = loadLetterOf(model);
    add(`${symbolLoad(t, 'x', letter)},\\ ${symbolLoad(t, 'y', letter)}`, `load applied at joint ${t} along x and along y, positive toward +x and +y${letter === 'P' ? '' : ` (written ${letter} here, as a joint label of this truss starts with P)`}`);
  }
  add('x,\\ y', 'the axes of the truss’s plane: x to the right, y up; joint positions (x, y) in m from the drawing’s origin');
  add('\\Sigma F_x = 0,\\ \\Sigma F_y = 0', 'equilibrium of a joint: the sum of the forces on it along x, and along y, is zero');
  if (analysis.cases.some((c) => c.reactionSteps.length)) {
    const about = tagOf(model.supports[0]?.joint ?? model.joints[0]?.id ?? 'A');
    add(`\\Sigma M_{${texText(about)}} = 0`, `the sum of the moments about a joint (about ${about}, for one) is zero; moments counter-clockwise positive, lever arms in m`);
  }
  add('(\\cos, \\sin)', 'direction cosines of a force’s line of action at a joint: of a member, from the joint toward its far end');
  add('m,\\ r,\\ j', 'numbers of members, of reaction components and of joints (the determinacy count m + r against 2j)');
  add('\\operatorname{rank} \\mathbf{A}', 'rank of the joint-equilibrium matrix A: one row per joint and direction (2j), one column per member force and reaction component; 2j for a stable truss');
  add('\\left|\\Sigma \\mathbf{F}\\right|', 'residual of a joint: the size of the sum of every force on it (members, loads, reactions) with the results put in; the check gives its largest over the joints');
  if (analysis.cases.some((c) => c.method === 'stiffness')) {
    const j = model.joints.find((p) => !model.supports.some((s) => s.joint === p.id))?.tag ?? model.joints[0]?.tag ?? 'A';
    const m0 = model.members[0]?.tag ?? 'AB';
    add(`k = EA/L,\\ k_{${texText(m0)}}`, `axial stiffness of a member (of member ${m0}, each by its tag): modulus E times area A over length L, in kN/m`);
    add('(c, s)', 'cosine and sine of a member’s angle from +x, from its first joint toward its second');
    add('\\delta', 'elongation of a member: the movement of its second joint less that of its first, along the member (from (c, s) and u, v); F = k δ');
    add(`u,\\ v;\\ u_{${texText(j)}},\\ v_{${texText(j)}}`, `movement of a free joint along x and along y (of joint ${j}, each by its tag)`);
    if (roller) add(`t_{${texText(tagOf(roller.joint))}}`, `movement of the roller joint ${tagOf(roller.joint)} along its rolling line (its one free movement)`);
    add('\\mathbf{K}\\,\\mathbf{u} = \\mathbf{P}', 'the stiffness equations: K the assembled stiffness matrix, u the joint movements, P the joint loads, each in the order of u');
  }
  out.push(...takeoffSymbols(takeoffSteps));
  return out.map((s) => ({ ...s, html: katexHtml(s.tex, false) }));
}

/**
 * The symbols the roof load takeoff's steps write (units as the steps print them: SI or US), listed under their own heading (its section)
 * for the kinds of step this sheet has: tributary widths, the continuous purlin and its
 * three-moment equation, line loads, reactions both ways, span patterns and wind on the slopes.
 */
function takeoffSymbols(steps: readonly TakeoffStep[]): Omit<DesignBasisSymbol, 'html'>[] {
  const out: Omit<DesignBasisSymbol, 'html'>[] = [];
  const has = (kind: TakeoffStep['kind']) => steps.some((s) => s.kind === kind);
  const add = (tex: string, meaning: string) => out.push({ tex, meaning, group: 'takeoff' });
  const tag = steps.find((s): s is Extract<TakeoffStep, { jointTag: string }> => 'jointTag' in s)?.jointTag ?? 'A';
  if (has('purlin-width')) {
    add(`b_{s},\\ b_{p};\\ b_{s,${texText(tag)}},\\ b_{p,${texText(tag)}}`, `tributary width of a purlin along the slope and on plan: half the distance to each neighbouring purlin (of the purlin at joint ${tag}, each by its joint)`);
  }
  if (has('purlin-beam') || has('span-pattern')) {
    add('L_{i}', 'span i of the purlin: the spacing of trusses i − 1 and i (i counted from the first end truss, 0)');
    add('M_{i}', 'bending moment of the continuous purlin over truss i, per 1 unit of purlin load (M = 0 at the end trusses), from the three-moment equation');
    add('R = c\\,w', 'reaction R of a purlin on this truss: c, its reaction per 1 unit of purlin load, times the purlin’s line load w');
    add('c_{\\mathrm{cont}},\\ c_{\\mathrm{trib}}', 'c of the purlin continuous over the trusses (three-moment equation), and by tributary length (half of each adjacent span)');
  }
  if (has('line-load') || has('wind-purlin')) add('w', 'line load of a purlin: area load times its tributary width');
  if (has('line-load')) {
    add('q', 'area load of a load case on the roof (a pressure), on the sloped area or on plan as entered (for wind, the velocity pressure)');
    add('q_{p}', 'the same area load per unit area of plan');
    add('\\theta', 'angle of the roof slope from the horizontal');
  } else if (has('wind-purlin')) add('q', 'velocity pressure of the wind');
  if (has('purlin-reaction')) {
    add('R_{\\mathrm{cont}},\\ R_{\\mathrm{trib}}', 'reaction of a purlin on this truss with c by the three-moment equation and with c by tributary length; the chosen one becomes the joint load');
    add('\\Delta', 'difference of the tributary reaction from the exact one, over the exact one');
  }
  if (has('span-pattern')) {
    add('r_{j}', 'reaction on this truss per 1 unit of purlin load on span j alone (three-moment equation); a pattern’s c is the sum over its loaded spans');
    add('c_{\\mathrm{all}},\\ \\Delta_{\\mathrm{all}}', 'c with every span loaded, and how much the chosen pattern’s c exceeds it');
  }
  if (has('wind-purlin')) {
    add('\\theta_{i}', 'angle of roof panel i from +x, positive where it rises to the right');
    add('\\Delta x_{i},\\ \\Delta y_{i},\\ s_{i}', 'run and rise of roof panel i, and its length along the slope');
    add('c_{i},\\ p_{i} = q\\,c_{i}', 'pressure coefficient of the slope of panel i (the engineer’s), and the wind pressure on it, positive towards the surface');
    add('w_{n,i};\\ w_{x,i},\\ w_{y,i};\\ w_{x},\\ w_{y}', 'line load of a purlin from panel i normal to the panel, and along x and y; without the panel number, the purlin’s sums over its panels along x and y');
  }
  if (out[0]) out[0].groupStart = true;
  return out;
}
