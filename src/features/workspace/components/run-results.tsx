import { useMemo, useState } from 'react';
import { caseSteps, reactionEnvelopeOf, type SolverStep, type TrussAnalysis } from '@shared/solver';
import type { RunView } from '@shared/schemas/run.schema';
import { readableFormat, type UnitSystemId } from '@shared/units';
import { Panel } from '@/components/ui/page-header';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { formatDateTime } from '@/lib/format';
import { useRun } from '../api/get-run';
import { FORCE_COLOURS, forceSense, forceStroke, forceText, forceDigits, senseMark } from '../utils/force-format';
import {
  forceRows,
  forceRowsFilter,
  resultForces,
  resultSourceKey,
  resultSourceParse,
  stepJoints,
  type GroupFilter,
  type ResultSource,
} from '../utils/run-results';
import { DesignResults } from './design-results';
import { ForceTable } from './force-table';
import { ReactionEnvelopeTable, upliftWords } from './reaction-envelope-table';
import { utilisationText } from '../utils/utilisation-look';
import { RunStatusBadge } from './run-status-badge';
import { SheetPdfJob } from './sheet-pdf-job';
import { SolverSteps } from './solver-steps';
import { TrussSvg, type JointArrow } from './truss-svg';

const LINK = 'inline-flex h-8 items-center rounded-xs border border-paper-line bg-paper-raised px-3 text-xs font-medium text-ink hover:bg-paper-sunk';
const SELECT = 'h-8 rounded-xs border border-paper-line bg-paper-raised px-2 text-[13px]';

/** A small number written so it can be read: 3.6 × 10⁻¹⁵ kN rather than 0.000 or 3.6e-15. */
function smallKn(v: number): string {
  return `${readableFormat(v, 4, 2)}\u202fkN`;
}

/** One run: its status, the classification, and for a solved run the forces, diagram and steps. */
export function RunResults({ runId, unitSystem, mayRun = false }: { runId: number; unitSystem: UnitSystemId; mayRun?: boolean }) {
  const run = useRun(runId);
  if (run.isPending) return <LoadingState label="Loading the run…" />;
  if (run.isError) return <ErrorState title="The run could not be loaded" error={run.error} onRetry={() => void run.refetch()} />;
  const r = run.data;

  return (
    <section aria-label={`Run ${r.number}`} className="flex flex-col gap-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold text-ink">
            Run <span className="figures">{r.number}</span>
          </h2>
          <p className="text-xs text-ink-soft">
            Model save <span className="figures">{r.modelVersion}</span> · run by {r.ranBy} · {formatDateTime(r.createdAt)}
            {r.usedTakeoff && ' · loads from the roof loading'}
          </p>
          {r.stale && (
            <p className="mt-1 text-xs font-medium text-compression">Out of date: the model changed after this run. Run the analysis again before using these results.</p>
          )}
        </div>
        {r.analysis && (
          <div className="flex flex-wrap gap-2">
            {r.status === 'solved' && (
              <a className={LINK} href={`/api/runs/${r.id}/forces.csv`} download>
                Member forces (CSV)
              </a>
            )}
            {r.status === 'solved' && (
              <a className={LINK} href={`/api/runs/${r.id}/reactions.csv`} download>
                Reactions (CSV)
              </a>
            )}
            <a className={LINK} href={`/api/runs/${r.id}/sheet`} target="_blank" rel="noreferrer">
              Preview the calc sheet ↗
            </a>
            <SheetPdfJob runId={r.id} />
          </div>
        )}
      </div>

      {(r.status === 'queued' || r.status === 'running') && (
        <Panel>
          <div className="flex items-center gap-3 text-sm text-ink-soft">
            <RunStatusBadge run={r} />
            <span>{r.status === 'queued' ? 'Waiting for the solver…' : `Phase: ${r.progress.phase}.`} The page follows the run; other work can go on meanwhile.</span>
          </div>
        </Panel>
      )}
      {r.status === 'failed' && (
        <div role="alert" className="rounded-xs border border-danger/30 bg-paper-raised px-5 py-4">
          <p className="text-sm font-semibold text-danger">The run failed</p>
          <p className="mt-1 text-sm text-ink-soft">{r.error?.message ?? 'The solver stopped without saying why.'}</p>
        </div>
      )}
      {r.analysis && <Analysis run={r} analysis={r.analysis} unitSystem={unitSystem} />}
      {r.analysis?.design && <DesignResults run={r} unitSystem={unitSystem} mayRun={mayRun} />}
    </section>
  );
}

function Analysis({ run, analysis, unitSystem }: { run: RunView; analysis: TrussAnalysis; unitSystem: UnitSystemId }) {
  const model = run.model;
  const tags = useMemo(() => new Map(model.joints.map((j) => [j.id, j.tag])), [model.joints]);
  const memberTags = useMemo(() => new Map(model.members.map((m) => [m.id, m.tag])), [model.members]);
  const cls = analysis.classification;
  const unstable = cls.kind === 'unstable';

  const sources: { key: string; label: string }[] = [
    ...analysis.cases.map((c) => ({ key: resultSourceKey({ kind: 'case', caseId: c.caseId }), label: `Load case ${c.caseId} — ${c.caseName}` })),
    ...analysis.combinations.map((c) => ({ key: resultSourceKey({ kind: 'combination', name: c.name }), label: `Combination ${c.name}` })),
    ...(analysis.envelope.length ? [{ key: 'envelope', label: `Envelope over the ${analysis.envelopeSource === 'combinations' ? 'combinations' : 'load cases'}` }] : []),
  ];
  const [sourceKey, setSourceKey] = useState(sources[0]?.key ?? 'envelope');
  const [filter, setFilter] = useState<GroupFilter>('all');
  const [hoverJoints, setHoverJoints] = useState<string[] | null>(null);
  const [activeStep, setActiveStep] = useState<SolverStep | null>(null);
  const source: ResultSource = resultSourceParse(sourceKey);
  const caseResult = source.kind === 'case' ? analysis.cases.find((c) => c.caseId === source.caseId) : undefined;
  const combo = source.kind === 'combination' ? analysis.combinations.find((c) => c.name === source.name) : undefined;
  const result = unstable ? null : resultForces(analysis, source);
  const rows = useMemo(() => (unstable ? [] : forceRowsFilter(forceRows(model, analysis, source), filter)), [unstable, model, analysis, sourceKey, filter]); // eslint-disable-line react-hooks/exhaustive-deps
  const steps = useMemo(() => (caseResult ? [cls.step, ...caseSteps(caseResult)] : [cls.step]), [caseResult, cls.step]);
  const hasGroups = model.members.some((m) => m.group);
  const reactionEnvelope = useMemo(() => reactionEnvelopeOf(analysis), [analysis]);
  const envelopeOver = analysis.combinations.length ? 'combinations' : 'load cases';
  const lifted = reactionEnvelope.filter((row) => upliftWords(row, unitSystem) !== null);
  // With a member design: the utilisation under the combination shown (the largest for the envelope).
  const design = (analysis as RunView['analysis'])?.design;
  const utilisationOf = useMemo(() => {
    if (!design || design.error) return undefined;
    const byId = new Map(design.members.map((m) => [m.member, m]));
    const name = source.kind === 'combination' ? source.name : source.kind === 'case' ? source.caseId : null;
    return (id: string) => {
      const d = byId.get(id);
      if (!d) return null;
      if (name === null) return { value: d.utilisation, text: utilisationText(d.utilisation, d.pass, !!d.refused) };
      const c = d.combinations.find((x) => x.name === name);
      if (!c) return null;
      const refused = !!d.refused && c.force < 0;
      return { value: c.ratio, text: utilisationText(c.ratio, !refused && c.ratio <= 1, refused) };
    };
  }, [design, sourceKey]); // eslint-disable-line react-hooks/exhaustive-deps

  const largest = result ? Math.max(0, ...Object.values(result.forces).map(Math.abs)) : 0;
  const arrows: JointArrow[] = [];
  if (result?.reactions) {
    for (const rc of result.reactions) {
      if (Math.hypot(rc.rx, rc.ry) > 1e-9) arrows.push({ joint: rc.joint, fx: rc.rx, fy: rc.ry, tone: 'reaction', label: forceText(Math.hypot(rc.rx, rc.ry), unitSystem) });
    }
  }
  if (caseResult) {
    const lc = model.loadCases.find((c) => c.id === caseResult.caseId);
    for (const l of lc?.loads ?? []) arrows.push({ joint: l.joint, fx: l.fx, fy: l.fy, tone: 'load', label: forceText(Math.hypot(l.fx, l.fy), unitSystem) });
  }

  const highlighted = new Set<string>(
    unstable ? cls.mechanismJoints : [...(hoverJoints ?? []), ...(activeStep ? stepJoints(activeStep) : []), ...(cls.conditioning?.nearMechanism && !hoverJoints && !activeStep ? cls.conditioning.joints : [])],
  );

  const onJointClick = (joint: { id: string }) => {
    const step = steps.find((s) => s.kind === 'joint' && s.joint === joint.id) ?? steps.find((s) => stepJoints(s).includes(joint.id));
    if (step) setActiveStep(step);
  };

  return (
    <div className="flex flex-col gap-4">
      <Panel title="Stability and determinacy">
        <p className={`text-sm ${unstable ? 'font-medium text-danger' : 'text-ink'}`}>
          {cls.kind === 'determinate' && 'Stable and statically determinate. '}
          {cls.kind === 'indeterminate' && `Stable and statically indeterminate to degree ${cls.degree}: forces by the direct stiffness method with each member’s EA. `}
          {unstable && 'Unstable: this truss cannot carry load as modelled. '}
          <span className={unstable ? 'text-ink' : 'text-ink-soft'}>{cls.message}</span>
        </p>
        {unstable && cls.mechanismJoints.length > 0 && (
          <p className="mt-1 text-sm text-ink">
            Joints that can move: <strong>{cls.mechanismJoints.map((id) => tags.get(id) ?? id).join(', ')}</strong> (circled on the drawing). No forces are shown for an unstable truss.
          </p>
        )}
        {cls.conditioning && (
          <p
            role={cls.conditioning.nearMechanism ? 'alert' : undefined}
            data-testid="conditioning"
            className={`mt-1 text-sm ${cls.conditioning.nearMechanism ? 'rounded-xs border border-danger/30 bg-paper-raised px-3 py-2 font-medium text-danger' : 'text-ink-soft'}`}
          >
            {cls.conditioning.message}
          </p>
        )}
        {analysis.symmetry.detected && <p className="mt-1 text-sm text-ink-soft">{analysis.symmetry.note}</p>}
      </Panel>

      {unstable ? (
        <Panel title="The truss as run">
          <TrussSvg
            label="Truss as run, with the joints of the mechanism circled"
            joints={model.joints}
            members={model.members}
            supports={model.supports}
            highlightJoints={highlighted}
            highlightTone="danger"
          />
        </Panel>
      ) : (
        <>
          <div className="flex flex-wrap items-center gap-3">
            <label className="flex items-center gap-2 text-sm text-ink-soft">
              Show
              <select aria-label="Results of" className={SELECT} value={sourceKey} onChange={(e) => { setSourceKey(e.target.value); setActiveStep(null); }}>
                {sources.map((s) => (
                  <option key={s.key} value={s.key}>
                    {s.label}
                  </option>
                ))}
              </select>
            </label>
            <label className="flex items-center gap-2 text-sm text-ink-soft">
              Members
              <select aria-label="Member group" className={SELECT} value={filter} onChange={(e) => setFilter(e.target.value as GroupFilter)} disabled={!hasGroups}>
                <option value="all">All</option>
                <option value="chords">Chords</option>
                <option value="top-chord">Top chord</option>
                <option value="bottom-chord">Bottom chord</option>
                <option value="web">Webs</option>
              </select>
            </label>
            {!hasGroups && <span className="text-xs text-ink-faint">Member groups were not assigned when this run was made.</span>}
          </div>

          <Panel title="Force diagram">
            <TrussSvg
              label="Force diagram: tension a thin line, compression a heavy line, zero force a faint dashed line"
              height={420}
              joints={model.joints}
              members={model.members}
              supports={model.supports}
              arrows={arrows}
              memberLook={(m) => {
                const s = forceStroke(result?.forces[m.id] ?? 0, largest);
                return { colour: s.colour, width: s.width, dash: s.dash };
              }}
              memberLabel={(m) => {
                const f = result?.forces[m.id] ?? 0;
                const sense = forceSense(f);
                return sense === '0' ? '0' : `${forceDigits(f, unitSystem)} ${senseMark(sense)}`;
              }}
              highlightJoints={highlighted}
              onJointClick={onJointClick}
              onJointHover={(j) => setHoverJoints(j ? [j.id] : null)}
            />
            <Legend />
          </Panel>

          {/* The envelope's tables (max, min and the source of each) take the full width; a case or a combination shares it with its steps. */}
          <div className={`grid grid-cols-1 gap-4 ${source.kind === 'envelope' ? '' : 'xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]'}`}>
            <div className="flex flex-col gap-3">
              <h3 className="text-sm font-semibold text-ink">Member forces</h3>
              <ForceTable rows={rows} envelope={source.kind === 'envelope'} unitSystem={unitSystem} utilisationOf={utilisationOf} />
              <p className="text-xs text-ink-faint">Tension positive, compression negative; (T) tension, (C) compression.</p>
            </div>
            <div className="flex flex-col gap-4">
              {result?.reactions && (
                <div>
                  <h3 className="mb-2 text-sm font-semibold text-ink">Reactions</h3>
                  <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
                    <thead>
                      <tr className="border-y border-ink-soft text-[12px] font-semibold text-ink-soft">
                        <th className="px-2 py-1.5 text-left">Joint</th>
                        <th className="px-2 py-1.5 text-left">Support</th>
                        <th className="px-2 py-1.5 text-right">Rx, {forceText(0, unitSystem).split('\u202f')[1]}</th>
                        <th className="px-2 py-1.5 text-right">Ry, {forceText(0, unitSystem).split('\u202f')[1]}</th>
                      </tr>
                    </thead>
                    <tbody className="figures">
                      {result.reactions.map((rc) => (
                        <tr key={rc.joint} className="border-b border-paper-line/60">
                          <td className="px-2 py-1 font-medium">{rc.tag}</td>
                          <td className="px-2 py-1 text-ink-soft">{rc.kind === 'pin' ? 'pin' : `roller at ${rc.angleDeg ?? 90}°`}</td>
                          <td className="px-2 py-1 text-right">{forceDigits(rc.rx, unitSystem)}</td>
                          <td className="px-2 py-1 text-right">{forceDigits(rc.ry, unitSystem)}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                  <p className="mt-1 text-xs text-ink-faint">+x right, +y up.</p>
                </div>
              )}

              {source.kind === 'envelope' && reactionEnvelope.length > 0 && <ReactionEnvelopeTable rows={reactionEnvelope} over={envelopeOver} unitSystem={unitSystem} />}
              {source.kind !== 'envelope' && lifted.length > 0 && (
                <p className="text-sm text-danger">
                  Uplift at {lifted.map((row) => row.at).join(', ')} under some {envelopeOver === 'combinations' ? 'combination' : 'load case'}: choose the envelope above for the hold-down force.
                </p>
              )}

              {caseResult && (
                <div>
                  <h3 className="mb-2 text-sm font-semibold text-ink">Zero-force members</h3>
                  {caseResult.zeroForce.length === 0 ? (
                    <p className="text-sm text-ink-soft">No member is seen to carry zero force at an unloaded joint in this case.</p>
                  ) : (
                    <ul className="flex flex-col gap-1 text-sm">
                      {caseResult.zeroForce.map((z) => (
                        <li key={z.id} className="cursor-pointer hover:text-accent" onMouseEnter={() => setHoverJoints([z.joint])} onMouseLeave={() => setHoverJoints(null)} onClick={() => setActiveStep(z)}>
                          <strong>{z.memberTag}</strong>{' '}
                          <span className="text-ink-soft">
                            — at joint {z.jointTag}, {z.rule === 1 ? 'two members not in line meet there, with no load and no support' : `${z.collinear?.map((id) => memberTags.get(id) ?? id).join(' and ')} are in line there and nothing else loads or holds the joint`}
                            {z.pass > 1 ? ' (found once the zero-force members above are set aside)' : ''}
                          </span>
                        </li>
                      ))}
                    </ul>
                  )}
                  {analysis.symmetry.detected && (
                    <p className="mt-2 text-xs text-ink-soft">
                      {caseResult.symmetry.loadsSymmetric ? 'The loads of this case are symmetric too: mirrored members carry equal forces.' : 'The loads of this case are not symmetric, so mirrored members differ.'}
                    </p>
                  )}
                </div>
              )}

              <div>
                <h3 className="mb-2 text-sm font-semibold text-ink">Equilibrium check</h3>
                {caseResult ? (
                  <p className="text-sm text-ink-soft">
                    Largest out-of-balance force at any joint, from the forces found: <span className="figures text-ink">{smallKn(caseResult.residual)}</span>
                    {caseResult.residualJoint ? ` (joint ${tags.get(caseResult.residualJoint) ?? caseResult.residualJoint})` : ''}, against a largest joint load of{' '}
                    <span className="figures">{caseResult.check.largestLoad.toFixed(2)} kN</span>.
                  </p>
                ) : combo ? (
                  <p className="text-sm text-ink-soft">
                    Largest out-of-balance force of the combined forces: <span className="figures text-ink">{smallKn(combo.residual)}</span>.
                  </p>
                ) : (
                  <p className="text-sm text-ink-soft">
                    Largest joint residual over every case and combination: <span className="figures text-ink">{run.maxResidual === null ? '—' : smallKn(run.maxResidual)}</span>.
                  </p>
                )}
              </div>
              {combo?.clause && <p className="text-xs text-ink-soft">Combination {combo.name}: {combo.clause}.</p>}
            </div>
          </div>

          <Panel title={caseResult ? `Joint by joint — load case ${caseResult.caseId} (${caseResult.method === 'stiffness' ? 'direct stiffness method' : 'method of joints'})` : 'Joint by joint'}>
            {caseResult ? (
              <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
                <div className="lg:sticky lg:top-2 lg:self-start">
                  <TrussSvg
                    label="Joints of the steps: point at a step to see its joint"
                    height={300}
                    joints={model.joints}
                    members={model.members}
                    supports={model.supports}
                    memberLook={(m) => {
                      const s = forceStroke(result?.forces[m.id] ?? 0, largest);
                      return { colour: s.colour, width: Math.min(s.width, 3), dash: s.dash };
                    }}
                    highlightJoints={highlighted}
                    onJointClick={onJointClick}
                  />
                  <p className="mt-2 text-xs text-ink-soft">Point at a step to see its joint here; click a joint to find its step.</p>
                </div>
                <SolverSteps steps={steps} activeStep={activeStep?.id ?? null} onActivate={setActiveStep} onHover={setHoverJoints} unitSystem={unitSystem} />
              </div>
            ) : (
              <p className="text-sm text-ink-soft">The equations are written per load case: choose a load case above to read them. Combinations add the cases’ forces with their factors.</p>
            )}
          </Panel>
        </>
      )}
    </div>
  );
}

function Legend() {
  return (
    <div className="mt-2 flex flex-wrap items-center gap-5 text-xs text-ink-soft" aria-hidden>
      <span className="flex items-center gap-2">
        <svg width="34" height="8">
          <line x1="1" y1="4" x2="33" y2="4" stroke={FORCE_COLOURS.T} strokeWidth="2" />
        </svg>
        tension (T), thin line
      </span>
      <span className="flex items-center gap-2">
        <svg width="34" height="8">
          <line x1="1" y1="4" x2="33" y2="4" stroke={FORCE_COLOURS.C} strokeWidth="5" />
        </svg>
        compression (C), heavy line
      </span>
      <span className="flex items-center gap-2">
        <svg width="34" height="8">
          <line x1="1" y1="4" x2="33" y2="4" stroke={FORCE_COLOURS['0']} strokeWidth="1.25" strokeDasharray="6 4" />
        </svg>
        zero force, dashed
      </span>
      <span>Each member carries its force written beside it. Loads: filled arrow heads; reactions: open heads.</span>
    </div>
  );
}
