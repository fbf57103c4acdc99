import type { Material, SteelMaterial, TimberMaterial } from './materials';
import type { Section } from './sections';
import { carriedStep, num, operandSig, type DesignStep } from './steps';
import { areaOut, DESIGN_UNITS, forceIn, lengthOut, stressAreaToForce, stressOut, type DesignUnitSet } from './units';

/** The design bases Panelpoint checks members by. */
export type DesignStandard = 'aisc360-16-lrfd' | 'aisc360-16-asd' | 'en1993-1-1' | 'nds-2018-asd';
export const DESIGN_STANDARDS: DesignStandard[] = ['aisc360-16-lrfd', 'aisc360-16-asd', 'en1993-1-1', 'nds-2018-asd'];

export type BucklingCurve = 'a0' | 'a' | 'b' | 'c' | 'd';
/** EN 1993-1-1 Table 6.1 imperfection factors. */
export const IMPERFECTION: Record<BucklingCurve, number> = { a0: 0.13, a: 0.21, b: 0.34, c: 0.49, d: 0.76 };

/** Partial factors of EN 1993-1-1 §6.1 (recommended values; a National Annex may set others). */
export interface EnFactors {
  gammaM0: number;
  gammaM1: number;
  gammaM2: number;
}
export const EN_RECOMMENDED: EnFactors = { gammaM0: 1.0, gammaM1: 1.0, gammaM2: 1.25 };

/** What one member is designed as. Lengths in mm. */
export interface MemberDesign {
  material: Material;
  section: Section;
  /** Effective-length factors in and out of plane. */
  Kx: number;
  Ky: number;
  /** Unbraced lengths in and out of plane, mm. */
  Lx: number;
  Ly: number;
  /** EN 1993-1-1 buckling curve (Table 6.2); default d, the most severe, when not given. */
  curve?: BucklingCurve;
}

/** One limit a member is held to in one sense: a resistance (kN) or a slenderness limit. */
export interface DesignLimit {
  clause: string;
  title: string;
  /** Available strength, kN (design strength φPn, allowable Pn/Ω, N_Rd or P′). */
  capacity?: number;
  /** Slenderness and its limit, when this is a slenderness check. */
  slenderness?: { value: number; limit: number };
}

export interface SenseCheck {
  sense: 'tension' | 'compression';
  steps: DesignStep[];
  limits: DesignLimit[];
  /** Least capacity of the limits, kN. */
  capacity: number;
}

const isSteel = (m: Material): m is SteelMaterial => m.kind === 'steel';

/** A member's values in the units its steps are printed in (lengths, radii, areas, stresses). */
interface Printed {
  u: DesignUnitSet;
  A: number;
  An: number;
  U: number;
  rx: number;
  ry: number;
  dx: number;
  dy: number;
  Lx: number;
  Ly: number;
  /** stress × area → force */
  k: number;
}

function printedOf(d: MemberDesign, u: DesignUnitSet): Printed {
  const s = d.section;
  return { u, A: areaOut(s.A, u), An: areaOut(s.An, u), U: s.U, rx: lengthOut(s.rx, u), ry: lengthOut(s.ry, u), dx: lengthOut(s.dx, u), dy: lengthOut(s.dy, u), Lx: lengthOut(d.Lx, u), Ly: lengthOut(d.Ly, u), k: stressAreaToForce(u) };
}

function slenderStep(clause: string, title: string, d: MemberDesign, p: Printed, K: boolean, limit: number | null, rx: number, ry: number, radii: [string, string], symbol: string): { step: DesignStep; value: number } {
  const kx = K ? d.Kx : 1;
  const ky = K ? d.Ky : 1;
  const sx = (kx * p.Lx) / rx;
  const sy = (ky * p.Ly) / ry;
  const value = Math.max(sx, sy);
  const kTxt = (k: string) => (K ? `${k} × ` : '');
  // Each ratio carries from its printed K, L and r; the larger is the result.
  const sxT = num(sx, 4);
  const syT = num(sy, 4);
  const ops = [kx, p.Lx, rx, ky, p.Ly, ry];
  const sig = Math.max(
    operandSig(ops.slice(0, 3), ([k, l, r]) => (k * l) / r, sxT),
    operandSig(ops.slice(3), ([k, l, r]) => (k * l) / r, syT),
  );
  const t = ops.map((x) => num(x, sig));
  const [sxR, syR] = [Number(sxT), Number(syT)];
  return {
    value,
    step: {
      clause,
      title,
      formula: `${symbol} = max(${K ? 'Kx·' : ''}Lx/${radii[0]}, ${K ? 'Ky·' : ''}Ly/${radii[1]})${limit !== null ? ` ≤ ${limit}` : ''}`,
      substituted: `max(${kTxt(t[0])}${t[1]} ${p.u.length}/${t[2]} ${p.u.length}, ${kTxt(t[3])}${t[4]} ${p.u.length}/${t[5]} ${p.u.length}) = max(${sxT}, ${syT})`,
      result: `${sxR >= syR ? sxT : syT}${limit !== null ? (value <= limit ? ` ≤ ${limit}` : ` > ${limit}: fails`) : ''}`,
      value,
    },
  };
}

function capacityOf(limits: DesignLimit[]): number {
  return Math.min(...limits.filter((l) => l.capacity !== undefined).map((l) => l.capacity as number));
}

/** AISC 360-16 Chapter D (tension) and §E3 (flexural buckling), LRFD (φ) or ASD (Ω). */
function aisc(sense: SenseCheck['sense'], asd: boolean, d: MemberDesign, m: SteelMaterial, u: DesignUnitSet): SenseCheck {
  const p = printedOf(d, u);
  const Fy = stressOut(m.Fy, u);
  const Fu = stressOut(m.Fu, u);
  const E = stressOut(m.E, u);
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  const factor = (Pn: number, phi: number, omega: number, clause: string, title: string) => {
    const v = asd ? Pn / omega : phi * Pn;
    steps.push(
      carriedStep({
        clause,
        title,
        formula: asd ? `Pn/Ω = Pn/${num(omega)}` : `φPn = ${num(phi)}·Pn`,
        ops: [Pn],
        text: ([pn]) => (asd ? `${pn} ${u.force}/${num(omega)}` : `${num(phi)} × ${pn} ${u.force}`),
        redo: ([pn]) => (asd ? pn / omega : phi * pn),
        value: v,
        unit: u.force,
      }),
    );
    limits.push({ clause, title, capacity: forceIn(v, u) });
  };
  const stressArea = (clause: string, title: string, formula: string, F: number, A: number) =>
    carriedStep({ clause, title, formula, ops: [F, A], text: ([f, a]) => `${f} ${u.stress} × ${a} ${u.area}`, redo: ([f, a]) => f * a * p.k, value: F * A * p.k, unit: u.force });
  if (sense === 'tension') {
    const Pny = Fy * p.A * p.k;
    steps.push(stressArea('AISC 360-16 D2(a)', 'Tensile yielding in the gross section', 'Pn = Fy·Ag', Fy, p.A));
    factor(Pny, 0.9, 1.67, 'AISC 360-16 D2(a)', 'Tensile yielding: available strength');
    const Ae = p.An * p.U;
    steps.push(carriedStep({ clause: 'AISC 360-16 D3', title: 'Effective net area', formula: 'Ae = An·U', ops: [p.An, p.U], text: ([an, uu]) => `${an} ${u.area} × ${uu}`, redo: ([an, uu]) => an * uu, value: Ae, unit: u.area }));
    const Pnr = Fu * Ae * p.k;
    steps.push(stressArea('AISC 360-16 D2(b)', 'Tensile rupture in the net section', 'Pn = Fu·Ae', Fu, Ae));
    factor(Pnr, 0.75, 2.0, 'AISC 360-16 D2(b)', 'Tensile rupture: available strength');
    const sl = slenderStep('AISC 360-16 D1 (user note)', 'Slenderness of a tension member (preferably ≤ 300; held as a limit here)', d, p, false, 300, p.rx, p.ry, ['rx', 'ry'], 'L/r');
    steps.push(sl.step);
    limits.push({ clause: 'AISC 360-16 D1', title: 'Slenderness L/r ≤ 300', slenderness: { value: sl.value, limit: 300 } });
  } else {
    const sl = slenderStep('AISC 360-16 E2 (user note)', 'Slenderness of a compression member (preferably ≤ 200; held as a limit here)', d, p, true, 200, p.rx, p.ry, ['rx', 'ry'], 'Lc/r');
    steps.push(sl.step);
    limits.push({ clause: 'AISC 360-16 E2', title: 'Slenderness Lc/r ≤ 200', slenderness: { value: sl.value, limit: 200 } });
    const lr = sl.value;
    const Fe = (Math.PI ** 2 * E) / lr ** 2;
    steps.push(carriedStep({ clause: 'AISC 360-16 E3 (E3-4)', title: 'Elastic buckling stress', formula: 'Fe = π²E/(Lc/r)²', ops: [E, lr], text: ([e, l]) => `π² × ${e} ${u.stress} / ${l}²`, redo: ([e, l]) => (Math.PI ** 2 * e) / l ** 2, value: Fe, unit: u.stress }));
    const lim = 4.71 * Math.sqrt(E / Fy);
    const inelastic = lr <= lim;
    const limT = num(lim, 4);
    const limSig = operandSig([E, Fy], ([e, f]) => 4.71 * Math.sqrt(e / f), limT);
    steps.push({ clause: 'AISC 360-16 E3', title: 'Inelastic or elastic buckling', formula: 'Lc/r ≤ 4.71·√(E/Fy) ?', substituted: `${num(lr, 4)} ${inelastic ? '≤' : '>'} 4.71 × √(${num(E, limSig)}/${num(Fy, limSig)}) = ${limT}`, result: inelastic ? 'inelastic: (E3-2)' : 'elastic: (E3-3)', value: lim });
    const Fcr = inelastic ? 0.658 ** (Fy / Fe) * Fy : 0.877 * Fe;
    steps.push(
      carriedStep({
        clause: inelastic ? 'AISC 360-16 E3 (E3-2)' : 'AISC 360-16 E3 (E3-3)',
        title: 'Critical stress',
        formula: inelastic ? 'Fcr = 0.658^(Fy/Fe)·Fy' : 'Fcr = 0.877·Fe',
        ops: [Fy, Fe],
        text: ([fy, fe]) => (inelastic ? `0.658^(${fy}/${fe}) × ${fy} ${u.stress}` : `0.877 × ${fe} ${u.stress}`),
        redo: ([fy, fe]) => (inelastic ? 0.658 ** (fy / fe) * fy : 0.877 * fe),
        value: Fcr,
        unit: u.stress,
      }),
    );
    const Pn = Fcr * p.A * p.k;
    steps.push(stressArea('AISC 360-16 E3 (E3-1)', 'Nominal compressive strength', 'Pn = Fcr·Ag', Fcr, p.A));
    factor(Pn, 0.9, 1.67, 'AISC 360-16 E1', 'Flexural buckling: available strength');
    steps.push({ clause: 'AISC 360-16 B4.1', title: 'Elements taken as nonslender', formula: 'b/t ≤ λr (Table B4.1a)', substituted: 'to be confirmed by the engineer for the chosen section', result: 'assumed nonslender (E7 not applied)', value: 0 });
  }
  return { sense, steps, limits, capacity: capacityOf(limits) };
}

/** EN 1993-1-1 χ for a non-dimensional slenderness λ̄ and imperfection factor α (6.49). */
export function enChi(lambdaBar: number, alpha: number): { Phi: number; chi: number } {
  const Phi = 0.5 * (1 + alpha * (lambdaBar - 0.2) + lambdaBar ** 2);
  if (lambdaBar <= 0.2) return { Phi, chi: 1 };
  return { Phi, chi: Math.min(1, 1 / (Phi + Math.sqrt(Phi ** 2 - lambdaBar ** 2))) };
}

/** EN 1993-1-1 §6.2.3 (tension), §6.2.4 and §6.3.1 (flexural buckling), class 1–3 sections. */
function en(sense: SenseCheck['sense'], d: MemberDesign, m: SteelMaterial, f: EnFactors, u: DesignUnitSet): SenseCheck {
  const p = printedOf(d, u);
  const fy = stressOut(m.Fy, u);
  const fu = stressOut(m.Fu, u);
  const E = stressOut(m.E, u);
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  const Npl = (p.A * fy * p.k) / f.gammaM0;
  const npl = (clause: string, title: string, formula: string) =>
    carriedStep({ clause, title, formula, ops: [p.A, fy, f.gammaM0], text: ([a, s, g]) => `${a} ${u.area} × ${s} ${u.stress} / ${g}`, redo: ([a, s, g]) => (a * s * p.k) / g, value: Npl, unit: u.force });
  if (sense === 'tension') {
    steps.push(npl('EN 1993-1-1 6.2.3 (6.6)', 'Plastic resistance of the gross section', 'Npl,Rd = A·fy/γM0'));
    limits.push({ clause: 'EN 1993-1-1 6.2.3 (6.6)', title: 'Npl,Rd', capacity: forceIn(Npl, u) });
    const Nu = (0.9 * p.An * fu * p.k) / f.gammaM2;
    steps.push(carriedStep({ clause: 'EN 1993-1-1 6.2.3 (6.7)', title: 'Ultimate resistance of the net section', formula: 'Nu,Rd = 0.9·Anet·fu/γM2', ops: [p.An, fu, f.gammaM2], text: ([a, s, g]) => `0.9 × ${a} ${u.area} × ${s} ${u.stress} / ${g}`, redo: ([a, s, g]) => (0.9 * a * s * p.k) / g, value: Nu, unit: u.force }));
    limits.push({ clause: 'EN 1993-1-1 6.2.3 (6.7)', title: 'Nu,Rd', capacity: forceIn(Nu, u) });
  } else {
    const curve = d.curve ?? 'd';
    const alpha = IMPERFECTION[curve];
    steps.push(npl('EN 1993-1-1 6.2.4 (6.10)', 'Cross-section resistance (class 1, 2 or 3 assumed)', 'Nc,Rd = A·fy/γM0'));
    limits.push({ clause: 'EN 1993-1-1 6.2.4 (6.10)', title: 'Nc,Rd', capacity: forceIn(Npl, u) });
    const lambda1 = Math.PI * Math.sqrt(E / fy);
    steps.push(carriedStep({ clause: 'EN 1993-1-1 6.3.1.3', title: 'Reference slenderness', formula: 'λ1 = π·√(E/fy)', ops: [E, fy], text: ([e, s]) => `π × √(${e}/${s})`, redo: ([e, s]) => Math.PI * Math.sqrt(e / s), value: lambda1 }));
    const sl = slenderStep('EN 1993-1-1 6.3.1.3', 'Slenderness Lcr/i (no limit in EN 1993-1-1)', d, p, true, null, p.rx, p.ry, ['ix', 'iy'], 'Lcr/i');
    steps.push(sl.step);
    const lb = sl.value / lambda1;
    steps.push(carriedStep({ clause: 'EN 1993-1-1 6.3.1.3 (6.50)', title: 'Non-dimensional slenderness', formula: 'λ̄ = (Lcr/i)/λ1', ops: [sl.value, lambda1], text: ([s, l]) => `${s} / ${l}`, redo: ([s, l]) => s / l, value: lb }));
    const { Phi, chi } = enChi(lb, alpha);
    steps.push({ clause: 'EN 1993-1-1 6.3.1.2 Table 6.1', title: `Imperfection factor, curve ${curve}${d.curve ? '' : ' (no curve given: the most severe taken)'}`, formula: `α (curve ${curve})`, substituted: `Table 6.1`, result: num(alpha), value: alpha });
    steps.push(carriedStep({ clause: 'EN 1993-1-1 6.3.1.2 (6.49)', title: 'Φ', formula: 'Φ = 0.5·[1 + α(λ̄ − 0.2) + λ̄²]', ops: [lb], text: ([l]) => `0.5 × [1 + ${num(alpha)} × (${l} − 0.2) + ${l}²]`, redo: ([l]) => 0.5 * (1 + alpha * (l - 0.2) + l * l), value: Phi }));
    steps.push(
      lb <= 0.2
        ? { clause: 'EN 1993-1-1 6.3.1.2 (6.49)', title: 'Reduction factor', formula: 'λ̄ ≤ 0.2: χ = 1 (6.3.1.2(4))', substituted: `${num(lb)} ≤ 0.2`, result: num(chi), value: chi }
        : carriedStep({ clause: 'EN 1993-1-1 6.3.1.2 (6.49)', title: 'Reduction factor', formula: 'χ = 1/(Φ + √(Φ² − λ̄²)) ≤ 1', ops: [Phi, lb], text: ([ph, l]) => `1/(${ph} + √(${ph}² − ${l}²))`, redo: ([ph, l]) => Math.min(1, 1 / (ph + Math.sqrt(ph * ph - l * l))), value: chi }),
    );
    const Nb = (chi * p.A * fy * p.k) / f.gammaM1;
    steps.push(carriedStep({ clause: 'EN 1993-1-1 6.3.1.1 (6.47)', title: 'Buckling resistance', formula: 'Nb,Rd = χ·A·fy/γM1', ops: [chi, p.A, fy, f.gammaM1], text: ([c, a, s, g]) => `${c} × ${a} ${u.area} × ${s} ${u.stress} / ${g}`, redo: ([c, a, s, g]) => (c * a * s * p.k) / g, value: Nb, unit: u.force }));
    limits.push({ clause: 'EN 1993-1-1 6.3.1.1 (6.46)', title: 'Nb,Rd', capacity: forceIn(Nb, u) });
  }
  return { sense, steps, limits, capacity: capacityOf(limits) };
}

/** NDS 2018 Column stability factor Cp (3.7-1) for FcE/Fc* = ratio and c. */
export function ndsCp(ratio: number, c: number): number {
  const a = (1 + ratio) / (2 * c);
  return a - Math.sqrt(a * a - ratio / c);
}

/** NDS 2018 §3.8 tension parallel to grain and §3.6/§3.7 compression with Cp (3.7-1), ASD. */
function nds(sense: SenseCheck['sense'], d: MemberDesign, m: TimberMaterial, u: DesignUnitSet): SenseCheck {
  const p = printedOf(d, u);
  const Ft = stressOut(m.Ft, u);
  const Fc = stressOut(m.Fc, u);
  const Emin = stressOut(m.Emin, u);
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  if (sense === 'tension') {
    const T = Ft * p.An * p.k;
    steps.push(carriedStep({ clause: 'NDS 2018 3.8.1', title: 'Allowable tension on the net section', formula: 'T′ = Ft′·An', ops: [Ft, p.An], text: ([f, a]) => `${f} ${u.stress} × ${a} ${u.area}`, redo: ([f, a]) => f * a * p.k, value: T, unit: u.force }));
    limits.push({ clause: 'NDS 2018 3.8.1', title: 'T′ = Ft′·An', capacity: forceIn(T, u) });
  } else {
    const sx = (d.Kx * p.Lx) / p.dx;
    const sy = (d.Ky * p.Ly) / p.dy;
    const r = Math.max(sx, sy);
    const sxT = num(sx, 4);
    const syT = num(sy, 4);
    const sig = Math.max(operandSig([d.Kx, p.Lx, p.dx], ([k, l, dd]) => (k * l) / dd, sxT), operandSig([d.Ky, p.Ly, p.dy], ([k, l, dd]) => (k * l) / dd, syT));
    const t = [d.Kx, p.Lx, p.dx, d.Ky, p.Ly, p.dy].map((x) => num(x, sig));
    const L = u.length;
    steps.push({ clause: 'NDS 2018 3.7.1.4', title: 'Slenderness ratio', formula: 'ℓe/d = max(Ke·Lx/dx, Ke·Ly/dy) ≤ 50', substituted: `max(${t[0]} × ${t[1]} ${L}/${t[2]} ${L}, ${t[3]} × ${t[4]} ${L}/${t[5]} ${L}) = max(${sxT}, ${syT})`, result: `${Number(sxT) >= Number(syT) ? sxT : syT}${r <= 50 ? ' ≤ 50' : ' > 50: fails'}`, value: r });
    limits.push({ clause: 'NDS 2018 3.7.1.4', title: 'ℓe/d ≤ 50', slenderness: { value: r, limit: 50 } });
    const FcE = (0.822 * Emin) / r ** 2;
    steps.push(carriedStep({ clause: 'NDS 2018 3.7.1', title: 'Critical buckling design value', formula: 'FcE = 0.822·E′min/(ℓe/d)²', ops: [Emin, r], text: ([e, l]) => `0.822 × ${e} ${u.stress} / ${l}²`, redo: ([e, l]) => (0.822 * e) / l ** 2, value: FcE, unit: u.stress }));
    const ratio = FcE / Fc;
    steps.push(carriedStep({ clause: 'NDS 2018 3.7.1', title: 'Ratio of the buckling value to Fc*', formula: 'FcE/Fc*', ops: [FcE, Fc], text: ([a, b]) => `${a} ${u.stress} / ${b} ${u.stress}`, redo: ([a, b]) => a / b, value: ratio }));
    const Cp = ndsCp(ratio, m.c);
    steps.push(
      carriedStep({
        clause: 'NDS 2018 3.7.1 (3.7-1)',
        title: 'Column stability factor',
        formula: 'Cp = (1 + FcE/Fc*)/(2c) − √{[(1 + FcE/Fc*)/(2c)]² − (FcE/Fc*)/c}',
        ops: [ratio, m.c],
        text: ([q, c]) => `(1 + ${q})/(2 × ${c}) − √([(1 + ${q})/(2 × ${c})]² − ${q}/${c})`,
        redo: ([q, c]) => ndsCp(q, c),
        value: Cp,
      }),
    );
    const P = Fc * Cp * p.A * p.k;
    steps.push(carriedStep({ clause: 'NDS 2018 3.6.3', title: 'Allowable compression', formula: 'P′ = Fc*·Cp·A', ops: [Fc, Cp, p.A], text: ([f, c, a]) => `${f} ${u.stress} × ${c} × ${a} ${u.area}`, redo: ([f, c, a]) => f * c * a * p.k, value: P, unit: u.force }));
    limits.push({ clause: 'NDS 2018 3.6.3', title: 'P′ = Fc′·A', capacity: forceIn(P, u) });
  }
  return { sense, steps, limits, capacity: capacityOf(limits) };
}

/**
 * The steps and limits of one member in one sense by the design basis. Capacities do not depend
 * on the force (no use is made of the EN 6.3.1.2(4) N_Ed/N_cr ≤ 0.04 exemption), so one check
 * per sense serves every combination. Capacities are in kN whatever `units` the steps are
 * printed in (SI by default; US customary: ksi, in², in, kip, each step computed in those units).
 */
export function senseCheck(standard: DesignStandard, sense: SenseCheck['sense'], d: MemberDesign, en1993: EnFactors = EN_RECOMMENDED, units: DesignUnitSet = DESIGN_UNITS.si): SenseCheck {
  const m = d.material;
  if (standard === 'nds-2018-asd') {
    if (m.kind !== 'timber') throw new Error('NDS checks need a timber material');
    return nds(sense, d, m, units);
  }
  if (!isSteel(m)) throw new Error('Steel checks need a steel material');
  if (standard === 'en1993-1-1') return en(sense, d, m, en1993, units);
  return aisc(sense, standard === 'aisc360-16-asd', d, m, units);
}
