import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQueryClient } from '@tanstack/react-query';
import type { Joint, Member, MemberGroup } from '@shared/model/truss';
import type { TrussModelView } from '@shared/schemas/drawing.schema';
import type { TakeoffInput } from '@shared/schemas/run.schema';
import type { RoofTakeoffResult } from '@shared/takeoff';
import { loadLetterOf } from '@shared/solver';
import { Button } from '@/components/ui/button';
import { Panel } from '@/components/ui/page-header';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { ApiError, errorMessage } from '@/lib/api-client';
import { formatDateTime } from '@/lib/format';
import { getTrussModelQueryOptions, useTrussModel } from '../api/get-model';
import { useSaveTrussModel } from '../api/save-model';
import { useDetachLoads } from '../api/detach-loads';
import { roofLoadsChanges, type RoofLoadsChange } from '@shared/model/roof-loads';
import { draftForget, draftKeep, draftTake } from '../utils/draft-store';
import {
  draftFromModelView,
  draftToSaveInput,
  modelDraftSchema,
  topChordJoints,
  type ModelDraft,
  type ModelDraftInput,
} from '../utils/model-draft';
import { CombinationsSection } from './combinations-section';
import { draftActions } from './draft-actions';
import { JobFileActions } from './job-file-actions';
import { JointPopover } from './joint-popover';
import { LoadsSection } from './loads-section';
import { MembersSection } from './members-section';
import { SupportsTable } from './supports-table';
import { TakeoffSection, type TakeoffFormValues } from './takeoff-section';
import { TrussSvg, type JointArrow, type MemberLook } from './truss-svg';

type Section = 'supports' | 'loads' | 'combinations' | 'members' | 'takeoff';

const SECTIONS: { id: Section; label: string }[] = [
  { id: 'supports', label: 'Supports' },
  { id: 'loads', label: 'Load cases & loads' },
  { id: 'combinations', label: 'Combinations' },
  { id: 'members', label: 'Members' },
  { id: 'takeoff', label: 'Roof loading' },
];

const GROUP_LOOK: Record<MemberGroup, MemberLook> = {
  'top-chord': { colour: '#2b2d2f', width: 3 },
  'bottom-chord': { colour: '#2b2d2f', width: 3 },
  web: { colour: '#55585c', width: 1.5 },
  other: { colour: '#8a8d90', width: 1.5 },
};

function takeoffDefaults(t: TakeoffInput | null): TakeoffFormValues {
  if (t) return structuredClone(t);
  return {
    topChordJoints: [],
    areaLoads: [{ caseId: '', q: Number.NaN, unit: 'kPa', basis: 'slope' }],
    spacing: Number.NaN,
    trussCount: 2,
    trussIndex: 0,
    method: 'exact',
  };
}

/** The "Model & loads" part of the truss page: the saved model, edited by engineers, read by everyone else. */
export function ModelWorkspace({ trussId, mayEdit }: { trussId: number; mayEdit: boolean }) {
  const model = useTrussModel(trussId);
  if (model.isPending) return <LoadingState label="Loading the model…" />;
  if (model.isError) {
    if (model.error instanceof ApiError && model.error.code === 'no-model-yet') {
      return <EmptyState>This truss has no model yet. Upload its DXF drawing on the Drawing tab; its joints and members become the model.</EmptyState>;
    }
    return <ErrorState title="The model could not be loaded" error={model.error} onRetry={() => void model.refetch()} />;
  }
  return <ModelEditor trussId={trussId} view={model.data} mayEdit={mayEdit} />;
}

interface Conflict {
  message: string;
  theirs: TrussModelView | null;
}

function ModelEditor({ trussId, view, mayEdit }: { trussId: number; view: TrussModelView; mayEdit: boolean }) {
  const queryClient = useQueryClient();
  const kept = useRef(draftTake(trussId)).current;
  const [baseVersion, setBaseVersion] = useState(kept?.version ?? view.version);
  const [restored, setRestored] = useState(Boolean(kept));
  const form = useForm<ModelDraftInput, unknown, ModelDraft>({
    ...MESSAGES_AFTER_TOUCH,
    resolver: zodResolver(modelDraftSchema),
    defaultValues: kept?.values ?? draftFromModelView(view),
  });
  const takeoffForm = useForm<TakeoffFormValues>({ defaultValues: (kept?.takeoffValues as TakeoffFormValues | undefined) ?? takeoffDefaults(draftFromModelView(view).takeoff) });
  const save = useSaveTrussModel();
  const detach = useDetachLoads();
  /** "Use these loads" waiting for the engineer's confirmation: what it will change, per case. */
  const [pendingUse, setPendingUse] = useState<{ input: TakeoffInput; result: RoofTakeoffResult; changes: RoofLoadsChange[] } | null>(null);
  const [conflict, setConflict] = useState<Conflict | null>(null);
  const [saveError, setSaveError] = useState<string | null>(null);
  const [section, setSection] = useState<Section>('supports');
  const [popover, setPopover] = useState<{ joint: Joint; at: { x: number; y: number } } | null>(null);
  const [selectedMembers, setSelectedMembers] = useState<Set<string>>(new Set());
  const [shownCase, setShownCase] = useState<string>('');
  const hasEdits = form.formState.isDirty || restored;
  // The save reads the version here: "save mine over theirs" changes it and saves at once.
  const versionRef = useRef(baseVersion);
  versionRef.current = baseVersion;

  // Edits survive a look at another tab; a reload or closing the page asks first.
  const latest = useRef({ hasEdits, baseVersion });
  latest.current = { hasEdits, baseVersion };
  useEffect(
    () => () => {
      if (latest.current.hasEdits) draftKeep(trussId, latest.current.baseVersion, form.getValues(), takeoffForm.getValues());
      else draftForget(trussId);
    },
    [form, takeoffForm, trussId],
  );
  useEffect(() => {
    if (!hasEdits) return;
    const warn = (e: BeforeUnloadEvent) => e.preventDefault();
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [hasEdits]);

  const loadView = useCallback(
    (v: TrussModelView) => {
      const draft = draftFromModelView(v);
      form.reset(draft);
      takeoffForm.reset(takeoffDefaults(draft.takeoff));
      setBaseVersion(v.version);
      setRestored(false);
      setConflict(null);
      setSaveError(null);
      draftForget(trussId);
    },
    [form, takeoffForm, trussId],
  );

  // Someone else's save arriving while nothing is edited here is simply shown.
  useEffect(() => {
    if (view.version !== baseVersion && !hasEdits) loadView(view);
  }, [view, baseVersion, hasEdits, loadView]);

  const submit = form.handleSubmit(async (draft) => {
    setSaveError(null);
    try {
      const saved = await save.mutateAsync({ trussId, input: draftToSaveInput(draft, versionRef.current) });
      loadView(saved);
    } catch (error) {
      if (error instanceof ApiError && error.status === 409) {
        const theirs = await queryClient.fetchQuery({ ...getTrussModelQueryOptions(trussId), staleTime: 0 }).catch(() => null);
        setConflict({ message: error.message, theirs });
      } else {
        setSaveError(errorMessage(error));
      }
    }
  });

  const joints = view.model.joints;
  const members = view.model.members;
  const draftSupports = useWatch({ control: form.control, name: 'supports' }) ?? [];
  const draftLoads = useWatch({ control: form.control, name: 'loads' }) ?? [];
  const draftCases = useWatch({ control: form.control, name: 'loadCases' }) ?? [];
  const draftMembers = useWatch({ control: form.control, name: 'members' }) ?? [];
  const draftTakeoff = useWatch({ control: form.control, name: 'takeoff' });
  const purlinPicks = useWatch({ control: takeoffForm.control, name: 'purlinJoints' });

  const groups = useMemo(() => new Map<string, MemberGroup | undefined>(draftMembers.map((m) => [m.id, m.group])), [draftMembers]);
  const topChord = useMemo(() => {
    const fromGroups = topChordJoints(view.model, groups);
    if (fromGroups.length >= 2 || !draftTakeoff) return fromGroups;
    const saved = new Set(draftTakeoff.topChordJoints);
    return joints.filter((j) => saved.has(j.id)).sort((a, b) => a.x - b.x);
  }, [view.model, groups, draftTakeoff, joints]);
  const topIds = useMemo(() => new Set(topChord.map((j) => j.id)), [topChord]);
  const purlins = useMemo(() => new Set((purlinPicks ?? topChord.map((j) => j.id)).filter((id) => topIds.has(id))), [purlinPicks, topChord, topIds]);

  const caseShown = draftCases.some((c) => c.id === shownCase) ? shownCase : (draftCases[0]?.id ?? '');
  const arrows: JointArrow[] = draftLoads
    .filter((l) => l.caseId === caseShown && Number.isFinite(l.fx) && Number.isFinite(l.fy))
    .map((l) => ({ joint: l.joint, fx: l.fx, fy: l.fy, tone: 'load', label: `${Math.hypot(l.fx, l.fy).toFixed(2)} kN` }));

  const togglePurlin = (joint: Joint) => {
    const current = [...purlins];
    const next = current.includes(joint.id) ? current.filter((id) => id !== joint.id) : [...current, joint.id];
    takeoffForm.setValue('purlinJoints', next, { shouldDirty: true });
  };

  const drawingProps =
    section === 'members'
      ? {
          onMemberClick: (m: Member) =>
            setSelectedMembers((s) => {
              const next = new Set(s);
              if (next.has(m.id)) next.delete(m.id);
              else next.add(m.id);
              return next;
            }),
          selectedMembers,
          memberLook: (m: Member) => {
            const g = groups.get(m.id);
            return g ? GROUP_LOOK[g] : { colour: '#8a8d90', width: 1.5, dash: '5 4' };
          },
          memberLabel: (m: Member) => m.tag,
        }
      : section === 'takeoff'
        ? {
            clickableJoints: mayEdit ? topIds : new Set<string>(),
            onJointClick: mayEdit ? togglePurlin : undefined,
            purlinJoints: purlins,
            memberLook: (m: Member) => (groups.get(m.id) === 'top-chord' ? GROUP_LOOK['top-chord'] : { colour: '#8a8d90', width: 1.5 }),
          }
        : { onJointClick: (joint: Joint, at: { x: number; y: number }) => setPopover({ joint, at }) };

  /** Marks (or, with null, unmarks) the draft's cases as holding the roof loading's loads. */
  const markCases = (ids: ReadonlySet<string> | null) => {
    const cases = form.getValues('loadCases') ?? [];
    cases.forEach((c, i) => {
      const marked = ids !== null && ids.has(c.id);
      if (marked !== (c.source === 'roof-loading')) form.setValue(`loadCases.${i}.source`, marked ? 'roof-loading' : undefined, { shouldDirty: true });
    });
  };
  // "Use these loads" first shows what it changes; nothing is saved until the engineer confirms.
  const useTakeoff = (input: TakeoffInput, result: RoofTakeoffResult) => {
    const draft = form.getValues();
    const cases = (draft.loadCases ?? []).map((c) => ({
      ...c,
      loads: (draft.loads ?? []).filter((l) => l.caseId === c.id).map((l) => ({ joint: l.joint, fx: Number(l.fx), fy: Number(l.fy) })),
    }));
    setPendingUse({ input, result, changes: roofLoadsChanges(cases, result.caseLoads) });
  };
  const confirmUse = () => {
    if (!pendingUse) return;
    const { input, result } = pendingUse;
    const marked = (form.getValues('loadCases') ?? []).filter((c) => c.source === 'roof-loading').map((c) => c.id);
    form.setValue('takeoff', input, { shouldDirty: true });
    draftActions(form).replaceCaseLoads(result.caseLoads);
    // The takeoff's cases are marked; one marked before stays marked (only detaching unmarks it).
    markCases(new Set([...marked, ...Object.keys(result.caseLoads)]));
    setPendingUse(null);
    void submit();
  };
  const removeTakeoff = () => {
    form.setValue('takeoff', null, { shouldDirty: true });
    // Without a takeoff its cases keep their loads as hand loads.
    markCases(null);
    void submit();
  };
  const detachCase = async (caseId: string) => {
    setSaveError(null);
    try {
      loadView(await detach.mutateAsync({ trussId, input: { version: versionRef.current, caseId } }));
    } catch (error) {
      setSaveError(errorMessage(error));
    }
  };

  const hint =
    section === 'members'
      ? 'Click members to select them, then set their group or properties below.'
      : section === 'takeoff'
        ? 'Click a top-chord joint to put or take away a purlin.'
        : mayEdit
          ? 'Click a joint to put a pin or a roller on it, or a joint load.'
          : 'Click a joint to see its support and loads.';

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label="Model and loads">
      <div className="sticky top-0 z-20 -mx-1 flex flex-wrap items-center justify-between gap-3 border-b border-paper-line bg-paper/95 px-1 py-2 backdrop-blur">
        <p className="text-xs text-ink-soft">
          <span className="figures">Model save {baseVersion}</span>
          {view.updatedBy && ` · saved by ${view.updatedBy}, ${formatDateTime(view.updatedAt)}`}
          {!mayEdit && ' · read only: engineers change supports and loads'}
        </p>
        <JobFileActions trussId={trussId} mayEdit={mayEdit} hasEdits={hasEdits} onImported={(v) => loadView(v)} />
        {mayEdit && (
          <div className="flex items-center gap-2">
            {hasEdits && <span className="text-xs font-medium text-compression">Unsaved changes</span>}
            <Button size="sm" variant="quiet" disabled={!hasEdits || save.isPending} onClick={() => loadView(queryClient.getQueryData(getTrussModelQueryOptions(trussId).queryKey) ?? view)}>
              Discard changes
            </Button>
            <Button size="sm" variant="primary" type="submit" busy={save.isPending} disabled={!hasEdits && !conflict}>
              Save model
            </Button>
          </div>
        )}
      </div>

      {conflict && (
        <div role="alert" className="rounded-xs border border-compression/40 bg-compression/5 px-4 py-3 text-sm">
          <p className="font-semibold text-ink">Not saved: someone else saved this model while you were editing.</p>
          <p className="mt-1 text-ink-soft">
            {conflict.theirs
              ? `${conflict.theirs.updatedBy || 'Someone'} saved model save ${conflict.theirs.version} at ${formatDateTime(conflict.theirs.updatedAt)}.`
              : conflict.message}{' '}
            Your edits are still here, unsaved. Load their save to see their changes (yours are dropped), or save yours over theirs.
          </p>
          <div className="mt-2 flex gap-2">
            <Button size="sm" onClick={() => conflict.theirs && loadView(conflict.theirs)} disabled={!conflict.theirs}>
              Load their save
            </Button>
            <Button
              size="sm"
              variant="primary"
              disabled={!conflict.theirs}
              onClick={() => {
                if (!conflict.theirs) return;
                versionRef.current = conflict.theirs.version;
                setBaseVersion(conflict.theirs.version);
                setConflict(null);
                void submit();
              }}
            >
              Save mine over theirs
            </Button>
          </div>
        </div>
      )}
      {saveError && (
        <p role="alert" className="rounded-xs border border-danger/30 bg-danger/5 px-3 py-2 text-sm text-danger">
          {saveError}
        </p>
      )}
      {Object.keys(form.formState.errors).length > 0 && (
        <p role="alert" className="rounded-xs border border-danger/30 bg-danger/5 px-3 py-2 text-sm text-danger">
          Some entries need fixing before the model can be saved: they are marked in {SECTIONS.filter((s) => sectionHasErrors(s.id, form.formState.errors)).map((s) => s.label).join(', ') || 'the tables'}.
        </p>
      )}

      <Panel
        title="Drawing"
        actions={
          section !== 'members' && section !== 'takeoff' && draftCases.length > 0 ? (
            <label className="flex items-center gap-2 text-xs text-ink-soft">
              Loads shown
              <select className="h-7 rounded-xs border border-paper-line bg-paper-raised px-2 text-xs" value={caseShown} onChange={(e) => setShownCase(e.target.value)}>
                {draftCases.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.id} — {c.name}
                  </option>
                ))}
              </select>
            </label>
          ) : undefined
        }
      >
        <p className="mb-2 text-xs text-ink-soft">{hint}</p>
        <TrussSvg
          label={`Truss model: ${joints.length} joints, ${members.length} members`}
          joints={joints}
          members={members}
          supports={draftSupports}
          arrows={section === 'members' || section === 'takeoff' ? [] : arrows}
          {...drawingProps}
          overlay={(fit, size) =>
            popover && section !== 'members' && section !== 'takeoff' ? (
              <JointPopover
                form={form}
                joint={popover.joint}
                at={fit.toScreen(popover.joint)}
                box={size}
                mayEdit={mayEdit}
                onClose={() => setPopover(null)}
              />
            ) : null
          }
        />
      </Panel>

      <div role="tablist" aria-label="Model parts" className="inline-flex flex-wrap divide-x divide-paper-rule border border-paper-rule bg-paper-raised">
        {SECTIONS.map((s) => (
          <button
            key={s.id}
            type="button"
            role="tab"
            aria-selected={section === s.id}
            onClick={() => {
              setSection(s.id);
              setPopover(null);
            }}
            // A ruled strip of the model's parts: the open one on the pad ground with the accent line along its foot.
            className={`relative px-3 py-1.5 text-sm ${
              section === s.id ? 'bg-accent-soft font-semibold text-ink after:absolute after:inset-x-0 after:bottom-0 after:h-[3px] after:bg-accent' : 'text-ink-soft hover:bg-paper-sunk hover:text-ink'
            } ${sectionHasErrors(s.id, form.formState.errors) ? 'text-danger underline decoration-danger decoration-double underline-offset-4' : ''}`}
          >
            {s.label}
          </button>
        ))}
      </div>

      <Panel>
        <fieldset disabled={!mayEdit} className="min-w-0">
          {section === 'supports' && <SupportsTable form={form} joints={joints} mayEdit={mayEdit} />}
          {section === 'loads' && (
            <LoadsSection
              form={form}
              joints={joints}
              mayEdit={mayEdit}
              onDetach={(id) => void detachCase(id)}
              detachBlocked={hasEdits ? 'Save or discard your changes before detaching loads from the roof loading.' : save.isPending || detach.isPending ? 'Saving…' : null}
            />
          )}
          {section === 'combinations' && <CombinationsSection form={form} mayEdit={mayEdit} />}
          {section === 'members' && (
            <MembersSection form={form} joints={joints} members={members} mayEdit={mayEdit} selected={selectedMembers} onSelect={setSelectedMembers} />
          )}
        </fieldset>
        {section === 'takeoff' && pendingUse && (
          <div role="alertdialog" aria-label="Use the roof loading's loads" className="mb-4 rounded-xs border border-accent/40 bg-accent-soft/40 px-4 py-3 text-sm">
            <p className="font-semibold text-ink">Use these loads? This saves the model with these changes:</p>
            <table className="mt-2 border-collapse text-[13px]" aria-label="What using the roof loading's loads changes">
              <thead>
                <tr className="border-y border-ink-soft text-left text-xs text-ink-soft">
                  <th className="py-1 pr-4">Load case</th>
                  <th className="py-1 pr-4">Change</th>
                  <th className="py-1 pr-4 text-right">Loads now</th>
                  <th className="py-1 pr-4 text-right">Total Fy now, kN</th>
                  <th className="py-1 pr-4 text-right">Loads after</th>
                  <th className="py-1 text-right">Total Fy after, kN</th>
                </tr>
              </thead>
              <tbody>
                {pendingUse.changes.map((c) => (
                  <tr key={c.caseId} className="border-b border-paper-line/60">
                    <td className="py-1 pr-4 font-medium">{c.caseId}</td>
                    <td className="py-1 pr-4">{c.kind === 'added' ? 'loads added' : c.kind === 'replaced' ? 'loads replaced' : 'no change'}</td>
                    <td className="figures py-1 pr-4 text-right">{c.before.count}</td>
                    <td className="figures py-1 pr-4 text-right">{c.before.totalFy.toFixed(2)}</td>
                    <td className="figures py-1 pr-4 text-right">{c.after.count}</td>
                    <td className="figures py-1 text-right">{c.after.totalFy.toFixed(2)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-2 text-xs text-ink-soft">
              These cases are then marked “from the roof loading” and read-only in the loads table; any other unsaved edits are saved with them.
            </p>
            <div className="mt-2 flex gap-2">
              <Button size="sm" variant="primary" busy={save.isPending} onClick={confirmUse}>
                Save these loads
              </Button>
              <Button size="sm" variant="quiet" onClick={() => setPendingUse(null)}>
                Cancel
              </Button>
            </div>
          </div>
        )}
        {section === 'takeoff' && (
          <TakeoffSection
            trussId={trussId}
            form={form}
            takeoffForm={takeoffForm}
            topChord={topChord}
            mayEdit={mayEdit}
            busy={save.isPending}
            onUse={useTakeoff}
            onRemove={removeTakeoff}
            hasSaved={Boolean(view.takeoff)}
            loadLetter={loadLetterOf(view.model)}
          />
        )}
      </Panel>
    </form>
  );
}

function sectionHasErrors(section: Section, errors: Record<string, unknown>): boolean {
  const keys: Record<Section, string[]> = {
    supports: ['supports'],
    loads: ['loadCases', 'loads'],
    combinations: ['combinations'],
    members: ['members'],
    takeoff: ['takeoff'],
  };
  return keys[section].some((k) => errors[k] !== undefined);
}
