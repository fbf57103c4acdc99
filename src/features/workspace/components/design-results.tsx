import { useMemo, useState } from 'react';
import { memberStepsIn, type RunDesign, type RunMemberDesign } from '@shared/design/basis';
import { DESIGN_UNITS, forceOut, lengthOut } from '@shared/design/units';
import type { RunView } from '@shared/schemas/run.schema';
import type { UnitSystemId } from '@shared/units';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/page-header';
import { errorMessage } from '@/lib/api-client';
import { useCreateRun } from '../api/create-run';
import { useTrussModel } from '../api/get-model';
import { useRecheckDesign } from '../api/recheck-design';
import { forceDigits } from '../utils/force-format';
import { BAND_LOOK, designFilterKeep, utilisationBand, utilisationText, type DesignFilter, type UtilisationBand } from '../utils/utilisation-look';
import { DeflectedShapeView } from './deflected-shape-view';
import { TrussSvg } from './truss-svg';

/** Infinite values arrive as null (a zero span). */
const fin = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const SELECT = 'h-8 rounded-xs border border-paper-line bg-paper-raised px-2 text-[13px]';

/** The member design checks of a run: the scale on the diagram, the table, the governing steps, the deflections. */
export function DesignResults({ run, unitSystem, mayRun }: { run: RunView; unitSystem: UnitSystemId; mayRun: boolean }) {
  const design = run.analysis?.design;
  const model = run.model;
  const current = useTrussModel(run.trussId);
  const recheck = useRecheckDesign();
  const create = useCreateRun();
  const [filter, setFilter] = useState<DesignFilter>('all');
  const [picked, setPicked] = useState<string | null>(null);
  const [actionError, setActionError] = useState<string | null>(null);
  const byMember = useMemo(() => new Map((design?.members ?? []).map((m) => [m.member, m])), [design]);
  if (!design) return null;

  // Did the sections change since this run? Determinate: re-check at once; indeterminate: re-run.
  const saved = current.data?.model.design;
  const sectionsChanged = current.data !== undefined && JSON.stringify(saved ?? null) !== JSON.stringify(model.design ?? null);
  const indeterminate = run.analysis?.classification.kind === 'indeterminate';
  const s = run.design;
  const rows = design.members.filter((m) => designFilterKeep(filter, m.utilisation, m.pass));
  const shown = picked ? byMember.get(picked) : design.members.find((m) => m.tag === s?.governingMember);

  const onRecheck = async () => {
    setActionError(null);
    try {
      await recheck.mutateAsync({ runId: run.id, input: current.data ? { modelVersion: current.data.version } : {} });
    } catch (e) {
      setActionError(errorMessage(e));
    }
  };
  const onRerun = async () => {
    setActionError(null);
    try {
      await create.mutateAsync({ trussId: run.trussId, input: current.data ? { modelVersion: current.data.version } : {} });
    } catch (e) {
      setActionError(errorMessage(e));
    }
  };

  return (
    <Panel title={`Member design — ${design.standardName}`}>
      <div className="flex flex-col gap-4">
        {design.error ? (
          <p role="alert" className="text-sm font-medium text-danger">
            The members could not be checked: {design.error.message}
          </p>
        ) : (
          <p className="text-sm text-ink" aria-label="Design summary">
            <strong className="figures">{s?.failing ?? 0}</strong> of <span className="figures">{design.members.length}</span> members fail,{' '}
            <strong className="figures">{s?.nearFailing ?? 0}</strong> near failing (utilisation 0.9 to 1.0). Largest utilisation{' '}
            <strong className="figures">{(s?.maxUtilisation ?? 0).toFixed(2)}</strong>
            {s?.governingMember ? ` in ${s.governingMember}` : ''}.
            {design.recheckedAt && <span className="text-ink-soft"> Re-checked with the saved sections on this run’s forces, without a new analysis.</span>}
          </p>
        )}
        {sectionsChanged && (
          <div className="flex flex-wrap items-center gap-3 rounded-xs border border-paper-line bg-paper-sunk px-4 py-3 text-sm" role="status">
            {indeterminate ? (
              <>
                <span>
                  The sections changed since this run. The truss is statically indeterminate, so its member forces depend on the members’ stiffness: <strong>a re-run is needed</strong>.
                </span>
                {mayRun && (
                  <Button size="sm" variant="primary" busy={create.isPending} onClick={() => void onRerun()}>
                    Run the analysis again
                  </Button>
                )}
              </>
            ) : (
              <>
                <span>The sections changed since this run. The truss is determinate, so its forces stand: the members can be re-checked at once.</span>
                {mayRun && (
                  <Button size="sm" variant="primary" busy={recheck.isPending} onClick={() => void onRecheck()}>
                    Re-check with the saved sections
                  </Button>
                )}
              </>
            )}
          </div>
        )}
        {actionError && (
          <p role="alert" className="text-sm text-danger">
            {actionError}
          </p>
        )}

        {!design.error && (
          <>
            <div className="flex flex-wrap items-center gap-3">
              <label className="flex items-center gap-2 text-sm text-ink-soft">
                Members
                <select aria-label="Design filter" className={SELECT} value={filter} onChange={(e) => setFilter(e.target.value as DesignFilter)}>
                  <option value="all">All</option>
                  <option value="failing-near">Failing and near failing</option>
                  <option value="failing">Failing</option>
                  <option value="near">Near failing</option>
                </select>
              </label>
              <span className="text-xs text-ink-faint">
                {rows.length} shown. Near failing: utilisation from 0.9 (common practice, no source).
              </span>
            </div>
            <TrussSvg
              label="Utilisation diagram: each member drawn by its band and labelled with its utilisation"
              height={380}
              joints={model.joints}
              members={model.members}
              supports={model.supports}
              memberLook={(m) => {
                const d = byMember.get(m.id);
                if (!d) return { colour: '#c9cdd1', width: 1 };
                const look = BAND_LOOK[utilisationBand(d.utilisation, d.pass)];
                const keep = designFilterKeep(filter, d.utilisation, d.pass);
                return keep ? { colour: look.colour, width: look.width, dash: look.dash } : { colour: '#dfe2e5', width: 1 };
              }}
              memberLabel={(m) => {
                const d = byMember.get(m.id);
                return d && designFilterKeep(filter, d.utilisation, d.pass) ? utilisationText(d.utilisation, d.pass, !!d.refused) : null;
              }}
              selectedMembers={picked ? new Set([picked]) : undefined}
              onMemberClick={(m) => setPicked(m.id)}
            />
            <ScaleLegend />
            <DesignTable rows={rows} unitSystem={unitSystem} picked={shown?.member ?? null} onPick={setPicked} />
            {shown && <MemberSteps member={shown} design={design} model={model} unitSystem={unitSystem} />}
            {design.deflection.length > 0 && <Deflections run={run} unitSystem={unitSystem} />}
            {design.deflection.length > 0 && <DeflectedShapeView model={model} shapes={design.shapes} unitSystem={unitSystem} />}
          </>
        )}
      </div>
    </Panel>
  );
}

function ScaleLegend() {
  return (
    <div className="flex flex-wrap items-center gap-5 text-xs text-ink-soft" aria-label="Utilisation scale">
      {(Object.keys(BAND_LOOK) as UtilisationBand[]).map((b) => (
        <span key={b} className="flex items-center gap-2">
          <svg width="34" height="10" aria-hidden>
            <line x1="1" y1="5" x2="33" y2="5" stroke={BAND_LOOK[b].colour} strokeWidth={BAND_LOOK[b].width} strokeDasharray={BAND_LOOK[b].dash} />
          </svg>
          {BAND_LOOK[b].label}
        </span>
      ))}
      <span>The number on each member is its utilisation; ✗ marks a failing member.</span>
    </div>
  );
}

function DesignTable({ rows, unitSystem, picked, onPick }: { rows: RunMemberDesign[]; unitSystem: UnitSystemId; picked: string | null; onPick: (id: string) => void }) {
  const th = 'px-2 py-1.5 text-left';
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse border-b border-ink-soft text-[13px]" aria-label="Member design checks">
        <thead>
          <tr className="border-y border-ink-soft text-[12px] font-semibold text-ink-soft">
            <th className={th}>Member</th>
            <th className={th}>Group</th>
            <th className={`${th} text-right`}>Tension ({unitSystem === 'us' ? 'kip' : 'kN'})</th>
            <th className={`${th} text-right`}>Compression ({unitSystem === 'us' ? 'kip' : 'kN'})</th>
            <th className={th}>Governing</th>
            <th className={th}>Check</th>
            <th className={`${th} text-right`}>Utilisation</th>
            <th className={th}>Result</th>
          </tr>
        </thead>
        <tbody className="figures">
          {rows.map((m) => {
            const top = m.checks.reduce<RunMemberDesign['checks'][number] | null>((a, c) => (!a || c.ratio > a.ratio ? c : a), null);
            const band = utilisationBand(m.utilisation, m.pass);
            return (
              <tr
                key={m.member}
                className={`cursor-pointer border-b border-paper-line/60 hover:bg-paper-sunk ${picked === m.member ? 'bg-accent-soft' : ''}`}
                onClick={() => onPick(m.member)}
                data-band={band}
              >
                <td className="px-2 py-1 font-medium">{m.tag}</td>
                <td className="px-2 py-1 text-ink-soft">{m.group}</td>
                <td className="px-2 py-1 text-right">{m.tension ? forceDigits(m.tension.force, unitSystem) : '—'}</td>
                <td className="px-2 py-1 text-right">{m.compression ? forceDigits(m.compression.force, unitSystem) : '—'}</td>
                <td className="px-2 py-1">{m.governing ?? '—'}</td>
                <td className="px-2 py-1 text-ink-soft">{m.refused ? 'AISC 360-16 E6 / EN 1993-1-1 6.4 not applied' : top ? `${top.clause} (${top.sense})` : '—'}</td>
                <td className="px-2 py-1 text-right">
                  <span className="inline-flex items-center gap-2">
                    <span aria-hidden className="inline-block h-2 w-14 overflow-hidden rounded-sm bg-paper-sunk">
                      <span className="block h-full" style={{ width: `${Math.min(100, m.utilisation * 100)}%`, background: BAND_LOOK[band].colour }} />
                    </span>
                    {utilisationText(m.utilisation, m.pass, !!m.refused)}
                  </span>
                </td>
                <td className={`px-2 py-1 ${m.pass ? (band === 'near' ? 'font-medium text-compression' : 'text-ink-soft') : 'font-semibold text-danger'}`}>
                  {m.pass ? (band === 'near' ? 'near failing' : 'passes') : 'fails'}
                  {m.reversal ? ' · reversal' : ''}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {rows.length === 0 && <p className="px-2 py-3 text-sm text-ink-soft">No member is in this band.</p>}
    </div>
  );
}

function MemberSteps({ member, design, model, unitSystem }: { member: RunMemberDesign; design: RunDesign; model: RunView['model']; unitSystem: UnitSystemId }) {
  // The run keeps its steps in SI; a US customary project sees them worked again in ksi, in², in, kip.
  const u = DESIGN_UNITS[unitSystem];
  const shown = memberStepsIn(model, design, member, u);
  return (
    <div aria-label={`Design steps of ${member.tag}`}>
      <h3 className="mb-2 text-sm font-semibold text-ink">
        Steps of {member.tag} ({member.group}){member.governing ? `, governing combination ${member.governing}` : ''}
      </h3>
      {member.refused && <p className="mb-2 text-sm font-medium text-danger">{member.refused}</p>}
      {[shown.tension, shown.compression].map((sc) =>
        sc ? (
          <div key={sc.sense} className="mb-3">
            <p className="text-xs font-semibold text-ink-soft">
              {sc.sense} — {sc.combination}, {forceOut(sc.force, u).toFixed(2)} {u.force}
            </p>
            <ol className="mt-1 flex flex-col gap-1 text-[13px]">
              {sc.steps.map((st, i) => (
                <li key={i} className="grid grid-cols-[minmax(0,14rem)_minmax(0,1fr)] gap-3">
                  <span className="text-ink-soft">{st.clause}</span>
                  <span>
                    <span className="text-ink-soft">{st.title}: </span>
                    {st.formula} = {st.substituted} = <strong>{st.result}</strong>
                  </span>
                </li>
              ))}
            </ol>
          </div>
        ) : null,
      )}
      {member.notes.length > 0 && <p className="text-xs text-ink-faint">{member.notes.join(' ')}</p>}
    </div>
  );
}

function Deflections({ run, unitSystem }: { run: RunView; unitSystem: UnitSystemId }) {
  const d = run.analysis!.design!.deflection;
  const u = DESIGN_UNITS[unitSystem];
  const dec = unitSystem === 'us' ? 3 : 2;
  const len = (mm: number) => lengthOut(mm, u).toFixed(dec);
  return (
    <div>
      <h3 className="mb-2 text-sm font-semibold text-ink">Deflection (unit-load method)</h3>
      <table className="w-full border-collapse border-b border-ink-soft text-[13px]" aria-label="Deflections">
        <thead>
          <tr className="border-y border-ink-soft text-[12px] font-semibold text-ink-soft">
            <th className="px-2 py-1.5 text-left">Joint</th>
            <th className="px-2 py-1.5 text-left">Combination</th>
            <th className="px-2 py-1.5 text-right">δx ({u.length})</th>
            <th className="px-2 py-1.5 text-right">δy ({u.length})</th>
            <th className="px-2 py-1.5 text-right">Allowed ({u.length})</th>
            <th className="px-2 py-1.5 text-right">Ratio</th>
            <th className="px-2 py-1.5 text-left">Result</th>
          </tr>
        </thead>
        <tbody className="figures">
          {d.map((r) => (
            <tr key={`${r.joint}-${r.combination}`} className="border-b border-paper-line/60">
              <td className="px-2 py-1 font-medium">{r.tag}</td>
              <td className="px-2 py-1">{r.combination}</td>
              <td className="px-2 py-1 text-right">{len(r.dx)}</td>
              <td className="px-2 py-1 text-right">{len(r.dy)}</td>
              <td className="px-2 py-1 text-right">
                {fin(r.allowed) ? len(r.allowed) : '—'} (span/{r.limit})
              </td>
              <td className="px-2 py-1 text-right">{fin(r.ratio) ? r.ratio.toFixed(2) : '—'}</td>
              <td className={`px-2 py-1 ${r.pass ? 'text-ink-soft' : 'font-semibold text-danger'}`}>{r.pass ? 'passes' : 'fails'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-1 text-xs text-ink-faint">δ = Σ n·N·L/(A·E); the span is between the outermost supports. The span/deflection limit is the engineer’s.</p>
    </div>
  );
}
