import type { DxfImportResult, DxfLayerInfo } from '@shared/dxf-import';

interface LayerListProps {
  layers: DxfLayerInfo[];
  result: DxfImportResult;
  colours: Map<string, string>;
  hidden: ReadonlySet<string>;
  onToggle: (layer: string) => void;
}

function countsText(counts: Record<string, number>): string {
  const parts = Object.entries(counts)
    .sort(([a], [b]) => a.localeCompare(b))
    .map(([type, n]) => `${n} ${type}`);
  return parts.length ? parts.join(' · ') : 'empty';
}

/**
 * Every layer of the drawing with its entities by type. Layers members came from carry their
 * colour and a switch to hide them in the view (the model keeps them).
 */
export function LayerList({ layers, result, colours, hidden, onToggle }: LayerListProps) {
  const membersPerLayer = new Map<string, number>();
  for (const m of result.members) membersPerLayer.set(m.layer, (membersPerLayer.get(m.layer) ?? 0) + 1);
  return (
    <ul className="divide-y divide-paper-line/70 text-[13px]" aria-label="Layers">
      {layers.map((layer) => {
        const members = membersPerLayer.get(layer.name) ?? 0;
        const used = result.layers.includes(layer.name);
        const shown = !hidden.has(layer.name);
        return (
          <li key={layer.name} className="flex items-center gap-3 py-1.5">
            {used ? (
              <label className="inline-flex min-w-0 flex-1 cursor-pointer items-center gap-2">
                <input type="checkbox" className="accent-accent" checked={shown} onChange={() => onToggle(layer.name)} aria-label={`Show layer ${layer.name}`} />
                <span aria-hidden className="h-[3px] w-5 shrink-0 rounded-full" style={{ background: colours.get(layer.name) ?? '#2b2d2f', opacity: shown ? 1 : 0.3 }} />
                <span className={`truncate font-medium ${shown ? 'text-ink' : 'text-ink-faint'}`}>{layer.name}</span>
                <span className="figures shrink-0 text-ink-soft">{members} {members === 1 ? 'member' : 'members'}</span>
              </label>
            ) : (
              <span className="inline-flex min-w-0 flex-1 items-center gap-2 pl-[22px] text-ink-faint">
                <span aria-hidden className="w-5 shrink-0" />
                <span className="truncate">{layer.name}</span>
                <span className="shrink-0 text-[11px]">{layer.holdsLines ? 'not imported' : 'no lines'}</span>
              </span>
            )}
            <span className="figures shrink-0 text-right text-[11px] text-ink-faint">{countsText(layer.counts)}</span>
          </li>
        );
      })}
    </ul>
  );
}
