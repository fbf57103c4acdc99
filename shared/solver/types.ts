/**
 * Result types of the truss solver. The calc sheet and the client render from these; every
 * step is plain data (ids, terms, values) and `stepToKatex` (katex.ts) turns any step into
 * KaTeX source.
 *
 * Units and signs, everywhere in this file unless a field says otherwise:
 * - forces in kN, lengths and coordinates in m, displacements in m, stiffness in kN/m;
 * - member force: tension positive, compression negative;
 * - a force term's direction cosines (cx, cy) give the direction in which the force acts on the
 *   joint for a positive value: a member in tension pulls the joint toward its far end, so its
 *   cosines are those of the vector from the joint to the far end; loads and reactions act along
 *   +x / +y (or a roller's reaction line);
 * - moments counter-clockwise positive; a moment term's coefficient is the signed lever arm (m).
 */

/** The verdict on stability and determinacy. */
export type DeterminacyKind = 'determinate' | 'indeterminate' | 'unstable';

/** Sense of a member force: tension, compression or (numerically) zero. */
export type ForceSense = 'T' | 'C' | '0';

/** What a force term stands for. `component` 'n' is a roller's reaction along its line. */
export type ForceRef =
  | { type: 'member'; member: string }
  | { type: 'reaction'; joint: string; component: 'x' | 'y' | 'n' }
  | { type: 'load'; joint: string; component: 'x' | 'y' };

/** One force in an equation: known (value set) or unknown (value null). */
export interface ForceTerm {
  ref: ForceRef;
  /** KaTeX source of the symbol, e.g. `F_{\mathrm{AB}}` or `R_{\mathrm{A},y}`. */
  symbol: string;
  /** Plain-text name, e.g. "AB", "R_A,y", "load at C (y)". */
  label: string;
  /**
   * Multiplier of the force in the equation: a direction cosine in ΣF equations, a signed lever
   * arm (m, counter-clockwise positive) in ΣM equations.
   */
  coefficient: number;
  /** kN when known at this step; null for an unknown being solved. */
  value: number | null;
}

/** A force acting on a joint, with the direction cosines of its line of action. */
export interface JointForce {
  ref: ForceRef;
  symbol: string;
  label: string;
  /** Direction cosines of the force on the joint for a positive value. */
  cx: number;
  cy: number;
  /** kN when known; null when unknown. */
  value: number | null;
  /** For a member force already known: the step id that found it (or 'zero-force rule'). */
  from?: string;
}

/** ΣFx = 0, ΣFy = 0 or ΣM about a joint = 0, as terms. The right-hand side is always 0. */
export interface EquilibriumEquation {
  kind: 'sum-fx' | 'sum-fy' | 'sum-m';
  /**
   * For 'sum-m': the joint the moments are taken about. For ΣF equations in a simultaneous
   * step: the joint whose equilibrium it is.
   */
  about?: { joint: string; tag: string; x: number; y: number };
  terms: ForceTerm[];
}

/** A force found by a step. */
export interface SolvedForce {
  ref: ForceRef;
  symbol: string;
  label: string;
  /** kN; tension positive for members, +x/+y (or along the roller line) for reactions. */
  value: number;
  /** Members only: (T), (C) or zero. */
  sense?: ForceSense;
}

interface StepBase {
  /** Stable, HTML-anchor-safe id, e.g. "case-D/joint-C". */
  id: string;
  /** Load case id the step belongs to ('' for model-level steps). */
  caseId: string;
  /** Short heading for the sheet, e.g. "Joint C". */
  title: string;
}

/** The count m + r against 2j and the rank of the joint-equilibrium matrix. */
export interface DeterminacyStep extends StepBase {
  kind: 'determinacy';
  m: number;
  r: number;
  j: number;
  /** m + r − 2j. */
  degree: number;
  /** Rank of the 2j × (m + r) joint-equilibrium matrix. */
  rank: number;
  verdict: DeterminacyKind;
}

/** A zero-force member found by one of the two joint rules. */
export interface ZeroForceFinding extends StepBase {
  kind: 'zero-force';
  member: string;
  memberTag: string;
  joint: string;
  jointTag: string;
  /**
   * 1: unloaded, unsupported joint with two non-collinear members (both zero).
   * 2: unloaded, unsupported joint with three members, two collinear (the third is zero).
   */
  rule: 1 | 2;
  /** Pass of the repeated search (1 = first look, 2 = after removing pass-1 members, …). */
  pass: number;
  /** Rule 2: the two collinear members at the joint. */
  collinear?: [string, string];
}

/** One global equilibrium equation for the support reactions, with numbers substituted. */
export interface ReactionStep extends StepBase {
  kind: 'reaction';
  equation: EquilibriumEquation;
  /** Reactions this equation gives (several when the three are solved together). */
  solves: SolvedForce[];
}

/** Method of joints: one joint with at most two unknowns. */
export interface JointStep extends StepBase {
  kind: 'joint';
  joint: string;
  jointTag: string;
  x: number;
  y: number;
  /** Known forces on the joint: loads, reactions found so far, member forces found so far. */
  known: JointForce[];
  /** The one or two unknowns, with direction cosines. */
  unknowns: JointForce[];
  /** [ΣFx = 0, ΣFy = 0] written with the known values substituted. */
  equations: [EquilibriumEquation, EquilibriumEquation];
  /** With one unknown: the equation used to solve it; the other is a check. */
  solvedFrom: 'both' | 'sum-fx' | 'sum-fy';
  solution: SolvedForce[];
}

/** Where no joint with ≤ 2 unknowns remains: the remaining unknowns solved together. */
export interface SimultaneousStep extends StepBase {
  kind: 'simultaneous';
  /** Why this step was needed, in words. */
  reason: string;
  joints: { joint: string; tag: string }[];
  unknowns: { ref: ForceRef; symbol: string; label: string }[];
  /** ΣFx and ΣFy at each listed joint, known values substituted. */
  equations: EquilibriumEquation[];
  solution: SolvedForce[];
}

/** Direct stiffness: each member's axial stiffness k = EA/L and direction cosines. */
export interface StiffnessMembersStep extends StepBase {
  kind: 'stiffness-members';
  rows: {
    member: string;
    tag: string;
    /** m */
    length: number;
    /** kN */
    EA: number;
    /** cos and sin of the member from its `from` joint to its `to` joint. */
    c: number;
    s: number;
    /** kN/m */
    k: number;
  }[];
}

/** Direct stiffness: the assembled stiffness matrix over the free degrees of freedom. */
export interface StiffnessAssemblyStep extends StepBase {
  kind: 'stiffness-assembly';
  /** Free degrees of freedom: a joint and the direction (unit vector) of the movement. */
  dofs: { joint: string; tag: string; dx: number; dy: number; label: string }[];
  /** K, kN/m; null when there are too many degrees of freedom to print (see `note`). */
  matrix: number[][] | null;
  /** Load vector over the dofs, kN. */
  loads: number[];
  note?: string;
}

/** Direct stiffness: the solved joint displacements. */
export interface StiffnessDisplacementsStep extends StepBase {
  kind: 'stiffness-displacements';
  /** m, +x right, +y up. */
  displacements: { joint: string; tag: string; ux: number; uy: number }[];
}

/** Direct stiffness: member forces N = k·(elongation) and reactions from support equilibrium. */
export interface StiffnessForcesStep extends StepBase {
  kind: 'stiffness-forces';
  rows: {
    member: string;
    tag: string;
    /** kN/m */
    k: number;
    /** m, lengthening positive */
    elongation: number;
    /** kN, tension positive */
    force: number;
    sense: ForceSense;
  }[];
}

export type StiffnessStep =
  | StiffnessMembersStep
  | StiffnessAssemblyStep
  | StiffnessDisplacementsStep
  | StiffnessForcesStep;

/** The independent check: largest resultant out-of-balance force at any joint. */
export interface CheckStep extends StepBase {
  kind: 'check';
  /** kN */
  residual: number;
  residualJoint: string | null;
  residualJointTag: string | null;
  /** Largest joint load of the case, kN (resultant). */
  largestLoad: number;
}

/** Every kind of step. */
export type SolverStep =
  | DeterminacyStep
  | ZeroForceFinding
  | ReactionStep
  | JointStep
  | SimultaneousStep
  | StiffnessStep
  | CheckStep;

/** Stability and determinacy of the model (independent of loads). */
export interface Classification {
  kind: DeterminacyKind;
  /** Members. */
  m: number;
  /** Reaction components (pin 2, roller 1). */
  r: number;
  /** Joints. */
  j: number;
  /** m + r − 2j (degree of indeterminacy when stable and positive). */
  degree: number;
  /** Rank of the joint-equilibrium matrix; 2j when stable. */
  rank: number;
  /** Ids of joints that can move without any member changing length (unstable models). */
  mechanismJoints: string[];
  /** What the finding means and, for an unstable model, what to do. */
  message: string;
  step: DeterminacyStep;
  /**
   * Stable models: how near the truss is to a mechanism (conditioning.ts). Absent in runs
   * stored before it existed and null for an unstable model.
   */
  conditioning?: Conditioning | null;
  /**
   * Unstable models: what makes them so. 'supports' — the members form one rigid truss and the
   * reaction lines are parallel or meet at one point (change a support); 'members' — a mechanism
   * within the members (add a member, `diagonal` names one that helps when found);
   * 'supports-and-members' — both. Null for a stable model; absent in older runs.
   */
  cause?: {
    kind: 'supports' | 'members' | 'supports-and-members';
    reason: string;
    diagonal?: { from: string; to: string; fromTag: string; toTag: string; panel: string[]; makesStable: boolean };
  } | null;
}

/** How near a stable truss is to a mechanism: singular values of the joint-equilibrium matrix. */
export interface Conditioning {
  /** What was measured, in words. */
  measure: string;
  /** Smallest and largest singular value of A (no unit); null when not computed. */
  sigmaMin: number | null;
  sigmaMax: number | null;
  /** σmin/σmax, the reciprocal condition number of A. */
  ratio: number | null;
  /** 1/σmin: kN of member and reaction force (root-sum-square) one kN of load can raise at most. */
  amplification: number | null;
  /** True when the amplification is above the warning level. */
  nearMechanism: boolean;
  /** Joints that move most in the near-mechanism (largest first): ids and tags. */
  joints: string[];
  jointTags: string[];
  /** The finding and, when near a mechanism, what to do. */
  message: string;
}

/** A support's reaction, kN. */
export interface SupportReaction {
  joint: string;
  tag: string;
  kind: 'pin' | 'roller';
  /** Roller only: angle of the reaction line from +x, degrees. */
  angleDeg?: number;
  /** kN, +x to the right. */
  rx: number;
  /** kN, +y up. */
  ry: number;
  /** The components as solved (pin: x and y; roller: along its line). */
  components: SolvedForce[];
}

/** Results of one load case. */
export interface CaseResult {
  caseId: string;
  caseName: string;
  /** How the member forces were found. */
  method: 'joints' | 'joints-and-simultaneous' | 'stiffness';
  /** Member id → kN, tension positive. */
  forces: Record<string, number>;
  reactions: SupportReaction[];
  zeroForce: ZeroForceFinding[];
  /** Global equilibrium; empty when the reactions come out of the joint or stiffness solve. */
  reactionSteps: ReactionStep[];
  /** Why reactionSteps is empty, when it is. */
  reactionNote?: string;
  jointSteps: JointStep[];
  simultaneousSteps: SimultaneousStep[];
  stiffnessSteps: StiffnessStep[];
  check: CheckStep;
  /** Largest resultant out-of-balance force at any joint, kN. */
  residual: number;
  residualJoint: string | null;
  /** Mirror symmetry of this case's loads (only meaningful when the model is symmetric). */
  symmetry: { loadsSymmetric: boolean; maxPairDifference: number | null };
}

/** Results of one combination (superposition of the factored load-case results). */
export interface CombinationResult {
  name: string;
  /** Load case id → factor. */
  factors: Record<string, number>;
  clause?: string;
  forces: Record<string, number>;
  reactions: SupportReaction[];
  /** kN, residual of the combined forces against the combined loads. */
  residual: number;
}

/** Extremes of one member over the combinations (or over the cases when there are none). */
export interface EnvelopeRow {
  member: string;
  tag: string;
  /** kN ≥ 0; 0 when never in tension. */
  maxTension: number;
  maxTensionCombo: string | null;
  /** kN ≤ 0; 0 when never in compression. */
  maxCompression: number;
  maxCompressionCombo: string | null;
  /** The combination with the largest |force|, and that force (kN, signed). */
  governing: string | null;
  governingForce: number;
}

/** Extremes of one support's reaction components over the combinations (or the cases). */
export interface ReactionEnvelopeRow {
  joint: string;
  /** The joint's tag. */
  at: string;
  /** kN, +x to the right; with the combination (or case) that gives it. */
  rxMax: number;
  rxMaxCombo: string | null;
  rxMin: number;
  rxMinCombo: string | null;
  /** kN, +y up; ryMin < 0 is uplift (the support must hold the truss down). */
  ryMax: number;
  ryMaxCombo: string | null;
  ryMin: number;
  ryMinCombo: string | null;
  /** In words when the support is pulled up under some combination, else null. */
  uplift: string | null;
}

/** Mirror symmetry of geometry and supports about a vertical axis. */
export interface Symmetry {
  detected: boolean;
  /** x of the mirror axis, m. */
  axisX: number | null;
  jointPairs: [string, string][];
  /** Members carrying equal force under symmetric loads (a member on the axis pairs with itself). */
  memberPairs: [string, string][];
  note: string;
}

/** Everything the solver returns. */
export interface TrussAnalysis {
  classification: Classification;
  symmetry: Symmetry;
  /** One per load case; empty for an unstable model. */
  cases: CaseResult[];
  combinations: CombinationResult[];
  envelope: EnvelopeRow[];
  /** Per support, over the same source as `envelope`; absent in runs stored before it existed. */
  reactionEnvelope?: ReactionEnvelopeRow[];
  /** What the envelope runs over. */
  envelopeSource: 'combinations' | 'cases';
}
