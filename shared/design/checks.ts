import type { Material, SteelMaterial, TimberMaterial } from './materials';
import type { Section } from './sections';
import { num, type DesignStep } from './steps';

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

function slenderStep(clause: string, title: string, d: MemberDesign, K: boolean, limit: number | null, rx: number, ry: number, symbol: string): { step: DesignStep; value: number } {
  const kx = K ? d.Kx : 1;
  const ky = K ? d.Ky : 1;
  const sx = (kx * d.Lx) / rx;
  const sy = (ky * d.Ly) / ry;
  const value = Math.max(sx, sy);
  const kTxt = (k: number) => (K ? `${num(k)} × ` : '');
  return {
    value,
    step: {
      clause,
      title,
      formula: `${symbol} = max(${K ? 'Kx·' : ''}Lx/${rx === d.section.rx ? 'rx' : 'dx'}, ${K ? 'Ky·' : ''}Ly/${ry === d.section.ry ? 'ry' : 'dy'})${limit !== null ? ` ≤ ${limit}` : ''}`,
      substituted: `max(${kTxt(kx)}${num(d.Lx)}/${num(rx)}, ${kTxt(ky)}${num(d.Ly)}/${num(ry)}) = max(${num(sx, 4)}, ${num(sy, 4)})`,
      result: `${num(value, 4)}${limit !== null ? (value <= limit ? ` ≤ ${limit}` : ` > ${limit}: fails`) : ''}`,
      value,
    },
  };
}

function capacityOf(limits: DesignLimit[]): number {
  return Math.min(...limits.filter((l) => l.capacity !== undefined).map((l) => l.capacity as number));
}

/** AISC 360-16 Chapter D (tension) and §E3 (flexural buckling), LRFD (φ) or ASD (Ω). */
function aisc(sense: SenseCheck['sense'], asd: boolean, d: MemberDesign, m: SteelMaterial): SenseCheck {
  const s = d.section;
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  const factor = (Pn: number, phi: number, omega: number, clause: string, title: string) => {
    const v = asd ? Pn / omega : phi * Pn;
    steps.push({
      clause,
      title,
      formula: asd ? `Pn/Ω = Pn/${num(omega)}` : `φPn = ${num(phi)}·Pn`,
      substituted: asd ? `${num(Pn)}/${num(omega)}` : `${num(phi)} × ${num(Pn)}`,
      result: `${num(v)} kN`,
      value: v,
    });
    limits.push({ clause, title, capacity: v });
  };
  if (sense === 'tension') {
    const Pny = (m.Fy * s.A) / 1000;
    steps.push({ clause: 'AISC 360-16 D2(a)', title: 'Tensile yielding in the gross section', formula: 'Pn = Fy·Ag', substituted: `${num(m.Fy)} MPa × ${num(s.A)} mm²`, result: `${num(Pny)} kN`, value: Pny });
    factor(Pny, 0.9, 1.67, 'AISC 360-16 D2(a)', 'Tensile yielding: available strength');
    const Ae = s.An * s.U;
    steps.push({ clause: 'AISC 360-16 D3', title: 'Effective net area', formula: 'Ae = An·U', substituted: `${num(s.An)} mm² × ${num(s.U)}`, result: `${num(Ae)} mm²`, value: Ae });
    const Pnr = (m.Fu * Ae) / 1000;
    steps.push({ clause: 'AISC 360-16 D2(b)', title: 'Tensile rupture in the net section', formula: 'Pn = Fu·Ae', substituted: `${num(m.Fu)} MPa × ${num(Ae)} mm²`, result: `${num(Pnr)} kN`, value: Pnr });
    factor(Pnr, 0.75, 2.0, 'AISC 360-16 D2(b)', 'Tensile rupture: available strength');
    const sl = slenderStep('AISC 360-16 D1 (user note)', 'Slenderness of a tension member (preferably ≤ 300; held as a limit here)', d, false, 300, s.rx, s.ry, 'L/r');
    steps.push(sl.step);
    limits.push({ clause: 'AISC 360-16 D1', title: 'Slenderness L/r ≤ 300', slenderness: { value: sl.value, limit: 300 } });
  } else {
    const sl = slenderStep('AISC 360-16 E2 (user note)', 'Slenderness of a compression member (preferably ≤ 200; held as a limit here)', d, true, 200, s.rx, s.ry, 'Lc/r');
    steps.push(sl.step);
    limits.push({ clause: 'AISC 360-16 E2', title: 'Slenderness Lc/r ≤ 200', slenderness: { value: sl.value, limit: 200 } });
    const lr = sl.value;
    const Fe = (Math.PI ** 2 * m.E) / lr ** 2;
    steps.push({ clause: 'AISC 360-16 E3 (E3-4)', title: 'Elastic buckling stress', formula: 'Fe = π²E/(Lc/r)²', substituted: `π² × ${num(m.E)} / ${num(lr, 4)}²`, result: `${num(Fe)} MPa`, value: Fe });
    const lim = 4.71 * Math.sqrt(m.E / m.Fy);
    const inelastic = lr <= lim;
    steps.push({ clause: 'AISC 360-16 E3', title: 'Inelastic or elastic buckling', formula: 'Lc/r ≤ 4.71·√(E/Fy) ?', substituted: `${num(lr, 4)} ${inelastic ? '≤' : '>'} 4.71 × √(${num(m.E)}/${num(m.Fy)}) = ${num(lim, 4)}`, result: inelastic ? 'inelastic: (E3-2)' : 'elastic: (E3-3)', value: lim });
    const Fcr = inelastic ? 0.658 ** (m.Fy / Fe) * m.Fy : 0.877 * Fe;
    steps.push({
      clause: inelastic ? 'AISC 360-16 E3 (E3-2)' : 'AISC 360-16 E3 (E3-3)',
      title: 'Critical stress',
      formula: inelastic ? 'Fcr = 0.658^(Fy/Fe)·Fy' : 'Fcr = 0.877·Fe',
      substituted: inelastic ? `0.658^(${num(m.Fy)}/${num(Fe)}) × ${num(m.Fy)}` : `0.877 × ${num(Fe)}`,
      result: `${num(Fcr)} MPa`,
      value: Fcr,
    });
    const Pn = (Fcr * s.A) / 1000;
    steps.push({ clause: 'AISC 360-16 E3 (E3-1)', title: 'Nominal compressive strength', formula: 'Pn = Fcr·Ag', substituted: `${num(Fcr)} MPa × ${num(s.A)} mm²`, result: `${num(Pn)} kN`, value: Pn });
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
function en(sense: SenseCheck['sense'], d: MemberDesign, m: SteelMaterial, f: EnFactors): SenseCheck {
  const s = d.section;
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  const Npl = (s.A * m.Fy) / f.gammaM0 / 1000;
  if (sense === 'tension') {
    steps.push({ clause: 'EN 1993-1-1 6.2.3 (6.6)', title: 'Plastic resistance of the gross section', formula: 'Npl,Rd = A·fy/γM0', substituted: `${num(s.A)} × ${num(m.Fy)} / ${num(f.gammaM0)}`, result: `${num(Npl)} kN`, value: Npl });
    limits.push({ clause: 'EN 1993-1-1 6.2.3 (6.6)', title: 'Npl,Rd', capacity: Npl });
    const Nu = (0.9 * s.An * m.Fu) / f.gammaM2 / 1000;
    steps.push({ clause: 'EN 1993-1-1 6.2.3 (6.7)', title: 'Ultimate resistance of the net section', formula: 'Nu,Rd = 0.9·Anet·fu/γM2', substituted: `0.9 × ${num(s.An)} × ${num(m.Fu)} / ${num(f.gammaM2)}`, result: `${num(Nu)} kN`, value: Nu });
    limits.push({ clause: 'EN 1993-1-1 6.2.3 (6.7)', title: 'Nu,Rd', capacity: Nu });
  } else {
    const curve = d.curve ?? 'd';
    const alpha = IMPERFECTION[curve];
    steps.push({ clause: 'EN 1993-1-1 6.2.4 (6.10)', title: 'Cross-section resistance (class 1, 2 or 3 assumed)', formula: 'Nc,Rd = A·fy/γM0', substituted: `${num(s.A)} × ${num(m.Fy)} / ${num(f.gammaM0)}`, result: `${num(Npl)} kN`, value: Npl });
    limits.push({ clause: 'EN 1993-1-1 6.2.4 (6.10)', title: 'Nc,Rd', capacity: Npl });
    const lambda1 = Math.PI * Math.sqrt(m.E / m.Fy);
    steps.push({ clause: 'EN 1993-1-1 6.3.1.3', title: 'Reference slenderness', formula: 'λ1 = π·√(E/fy)', substituted: `π × √(${num(m.E)}/${num(m.Fy)})`, result: num(lambda1), value: lambda1 });
    const sl = slenderStep('EN 1993-1-1 6.3.1.3', 'Slenderness Lcr/i (no limit in EN 1993-1-1)', d, true, null, s.rx, s.ry, 'Lcr/i');
    steps.push(sl.step);
    const lb = sl.value / lambda1;
    steps.push({ clause: 'EN 1993-1-1 6.3.1.3 (6.50)', title: 'Non-dimensional slenderness', formula: 'λ̄ = (Lcr/i)/λ1', substituted: `${num(sl.value, 4)} / ${num(lambda1)}`, result: num(lb), value: lb });
    const { Phi, chi } = enChi(lb, alpha);
    steps.push({ clause: 'EN 1993-1-1 6.3.1.2 Table 6.1', title: `Imperfection factor, curve ${curve}${d.curve ? '' : ' (no curve given: the most severe taken)'}`, formula: `α (curve ${curve})`, substituted: `Table 6.1`, result: num(alpha), value: alpha });
    steps.push({ clause: 'EN 1993-1-1 6.3.1.2 (6.49)', title: 'Φ', formula: 'Φ = 0.5·[1 + α(λ̄ − 0.2) + λ̄²]', substituted: `0.5 × [1 + ${num(alpha)} × (${num(lb)} − 0.2) + ${num(lb)}²]`, result: num(Phi), value: Phi });
    steps.push({ clause: 'EN 1993-1-1 6.3.1.2 (6.49)', title: 'Reduction factor', formula: lb <= 0.2 ? 'λ̄ ≤ 0.2: χ = 1 (6.3.1.2(4))' : 'χ = 1/(Φ + √(Φ² − λ̄²)) ≤ 1', substituted: lb <= 0.2 ? `${num(lb)} ≤ 0.2` : `1/(${num(Phi)} + √(${num(Phi)}² − ${num(lb)}²))`, result: num(chi), value: chi });
    const Nb = (chi * s.A * m.Fy) / f.gammaM1 / 1000;
    steps.push({ clause: 'EN 1993-1-1 6.3.1.1 (6.47)', title: 'Buckling resistance', formula: 'Nb,Rd = χ·A·fy/γM1', substituted: `${num(chi)} × ${num(s.A)} × ${num(m.Fy)} / ${num(f.gammaM1)}`, result: `${num(Nb)} kN`, value: Nb });
    limits.push({ clause: 'EN 1993-1-1 6.3.1.1 (6.46)', title: 'Nb,Rd', capacity: Nb });
  }
  return { sense, steps, limits, capacity: capacityOf(limits) };
}

/** NDS 2018 Column stability factor Cp (3.7-1) for FcE/Fc* = ratio and c. */
export function ndsCp(ratio: number, c: number): number {
  const a = (1 + ratio) / (2 * c);
  return a - Math.sqrt(a * a - ratio / c);
}

/** NDS 2018 §3.8 tension parallel to grain and §3.6/§3.7 compression with Cp (3.7-1), ASD. */
function nds(sense: SenseCheck['sense'], d: MemberDesign, m: TimberMaterial): SenseCheck {
  const s = d.section;
  const steps: DesignStep[] = [];
  const limits: DesignLimit[] = [];
  if (sense === 'tension') {
    const T = (m.Ft * s.An) / 1000;
    steps.push({ clause: 'NDS 2018 3.8.1', title: 'Allowable tension on the net section', formula: "T′ = Ft′·An", substituted: `${num(m.Ft)} MPa × ${num(s.An)} mm²`, result: `${num(T)} kN`, value: T });
    limits.push({ clause: 'NDS 2018 3.8.1', title: "T′ = Ft′·An", capacity: T });
  } else {
    const sx = (d.Kx * d.Lx) / s.dx;
    const sy = (d.Ky * d.Ly) / s.dy;
    const r = Math.max(sx, sy);
    steps.push({ clause: 'NDS 2018 3.7.1.4', title: 'Slenderness ratio', formula: 'ℓe/d = max(Ke·Lx/dx, Ke·Ly/dy) ≤ 50', substituted: `max(${num(d.Kx)} × ${num(d.Lx)}/${num(s.dx)}, ${num(d.Ky)} × ${num(d.Ly)}/${num(s.dy)})`, result: `${num(r, 4)}${r <= 50 ? ' ≤ 50' : ' > 50: fails'}`, value: r });
    limits.push({ clause: 'NDS 2018 3.7.1.4', title: 'ℓe/d ≤ 50', slenderness: { value: r, limit: 50 } });
    const FcE = (0.822 * m.Emin) / r ** 2;
    steps.push({ clause: 'NDS 2018 3.7.1', title: 'Critical buckling design value', formula: "FcE = 0.822·E′min/(ℓe/d)²", substituted: `0.822 × ${num(m.Emin)} / ${num(r, 4)}²`, result: `${num(FcE)} MPa`, value: FcE });
    const ratio = FcE / m.Fc;
    const Cp = ndsCp(ratio, m.c);
    steps.push({
      clause: 'NDS 2018 3.7.1 (3.7-1)',
      title: 'Column stability factor',
      formula: 'Cp = (1 + FcE/Fc*)/(2c) − √{[(1 + FcE/Fc*)/(2c)]² − (FcE/Fc*)/c}',
      substituted: `FcE/Fc* = ${num(FcE)}/${num(m.Fc)} = ${num(ratio)}, c = ${num(m.c)}`,
      result: num(Cp),
      value: Cp,
    });
    const P = (m.Fc * Cp * s.A) / 1000;
    steps.push({ clause: 'NDS 2018 3.6.3', title: 'Allowable compression', formula: "P′ = Fc*·Cp·A", substituted: `${num(m.Fc)} × ${num(Cp)} × ${num(s.A)}`, result: `${num(P)} kN`, value: P });
    limits.push({ clause: 'NDS 2018 3.6.3', title: "P′ = Fc′·A", capacity: P });
  }
  return { sense, steps, limits, capacity: capacityOf(limits) };
}

/**
 * The steps and limits of one member in one sense by the design basis. Capacities do not depend
 * on the force (no use is made of the EN 6.3.1.2(4) N_Ed/N_cr ≤ 0.04 exemption), so one check
 * per sense serves every combination.
 */
export function senseCheck(standard: DesignStandard, sense: SenseCheck['sense'], d: MemberDesign, en1993: EnFactors = EN_RECOMMENDED): SenseCheck {
  const m = d.material;
  if (standard === 'nds-2018-asd') {
    if (m.kind !== 'timber') throw new Error('NDS checks need a timber material');
    return nds(sense, d, m);
  }
  if (!isSteel(m)) throw new Error('Steel checks need a steel material');
  if (standard === 'en1993-1-1') return en(sense, d, m, en1993);
  return aisc(sense, standard === 'aisc360-16-asd', d, m);
}
