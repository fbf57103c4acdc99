import { useEffect, useMemo, useRef } from 'react';
import { stepToKatex, stepsOperandDecimals, type SolverStep } from '@shared/solver';
import { jointFbdSvg } from '@shared/drawing/truss-svg';
import type { UnitSystemId } from '@shared/units';
import { FORCE_ZERO_KN, forceText } from '../utils/force-format';
import { stepJoints } from '../utils/run-results';
import { Tex } from './tex';

interface SolverStepsProps {
  steps: SolverStep[];
  /** The step picked (by clicking it or its joint on the diagram). */
  activeStep: string | null;
  onActivate: (step: SolverStep) => void;
  onHover: (joints: string[] | null) => void;
  /** Units of the free-body diagrams' force labels. */
  unitSystem: UnitSystemId;
}

const KIND_LABEL: Partial<Record<SolverStep['kind'], string>> = {
  determinacy: 'Stability and determinacy',
  'zero-force': 'Zero-force member',
  reaction: 'Support reactions',
  joint: 'Method of joints',
  simultaneous: 'Solved together',
  'stiffness-members': 'Direct stiffness',
  'stiffness-assembly': 'Direct stiffness',
  'stiffness-displacements': 'Direct stiffness',
  'stiffness-forces': 'Direct stiffness',
  check: 'Equilibrium check',
};

/**
 * A joint step's free-body diagram, drawn by the same code as the calc sheet's
 * (shared/drawing/truss-svg.ts). The SVG is our own string with every label escaped.
 */
function JointFbd({ step, unitSystem }: { step: Extract<SolverStep, { kind: 'joint' }>; unitSystem: UnitSystemId }) {
  const svg = useMemo(() => jointFbdSvg(step, { formatForce: (kN) => forceText(kN, unitSystem), zeroTolerance: FORCE_ZERO_KN }), [step, unitSystem]);
  return <figure className="m-0 self-start rounded-xs border border-paper-line bg-paper-raised [&>svg]:block [&>svg]:h-auto [&>svg]:w-full" dangerouslySetInnerHTML={{ __html: svg }} />;
}

/**
 * The solver's steps typeset with KaTeX; each step with joints lights them on the diagram. A
 * joint step shows its free-body diagram beside its equations, as the calc sheet does.
 */
export function SolverSteps({ steps, activeStep, onActivate, onHover, unitSystem }: SolverStepsProps) {
  const listRef = useRef<HTMLOListElement>(null);
  useEffect(() => {
    if (!activeStep) return;
    listRef.current?.querySelector(`[data-step="${CSS.escape(activeStep)}"]`)?.scrollIntoView({ block: 'nearest', behavior: 'smooth' });
  }, [activeStep]);
  // Reactions solved together are printed with the operand decimals of their group.
  const operand = useMemo(() => stepsOperandDecimals(steps, 3), [steps]);

  return (
    <ol ref={listRef} className="flex flex-col gap-2">
      {steps.map((step) => {
        const joints = stepJoints(step);
        const active = step.id === activeStep;
        return (
          <li
            key={step.id}
            data-step={step.id}
            id={`step-${step.id}`}
            className={`rounded-xs border px-3 py-2 transition-colors ${active ? 'border-accent bg-accent-soft/40' : 'border-paper-line bg-paper-raised'} ${joints.length ? 'cursor-pointer hover:border-accent/50' : ''}`}
            onMouseEnter={() => joints.length && onHover(joints)}
            onMouseLeave={() => onHover(null)}
            onClick={() => joints.length && onActivate(step)}
          >
            <p className="flex items-baseline justify-between gap-2 text-xs">
              <span className="font-semibold text-ink">{step.title}</span>
              <span className="text-ink-faint">{KIND_LABEL[step.kind]}</span>
            </p>
            {step.kind === 'joint' ? (
              <div className="mt-1 grid grid-cols-1 gap-3 sm:grid-cols-[minmax(0,21rem)_minmax(0,1fr)]">
                <JointFbd step={step} unitSystem={unitSystem} />
                <div className="min-w-0">
                  {stepToKatex(step, { operandDecimals: operand.get(step.id) }).map((line, i) => (
                    <Tex key={i} source={line} />
                  ))}
                </div>
              </div>
            ) : (
              stepToKatex(step, { operandDecimals: operand.get(step.id) }).map((line, i) => <Tex key={i} source={line} />)
            )}
          </li>
        );
      })}
    </ol>
  );
}
