import type { DrawingSummaryView } from '@shared/schemas/drawing.schema';
import { Badge } from '@/components/ui/page-header';
import { formatDateTime } from '@/lib/format';
import { drawingFileUrl } from '../api/get-drawing';
import { formatBytes } from '../utils/units';

interface DrawingVersionsProps {
  versions: DrawingSummaryView[];
  selectedId: number | null;
  onSelect: (id: number) => void;
}

/** Every uploaded version, newest first: who sent it, when, how it imported, and its original file. */
export function DrawingVersions({ versions, selectedId, onSelect }: DrawingVersionsProps) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
        <thead>
          <tr className="border-y border-ink-soft text-[12px] font-semibold text-ink-soft">
            <th scope="col" className="py-1.5 pr-3 text-left">Drawing version</th>
            <th scope="col" className="py-1.5 pr-3 text-left">File and upload</th>
            <th scope="col" className="py-1.5 pr-3 text-left">Status</th>
            <th scope="col" className="py-1.5 pr-3 text-right">Joints</th>
            <th scope="col" className="py-1.5 pr-3 text-right">Members</th>
            <th scope="col" className="py-1.5 pr-3 text-left">SHA-256</th>
            <th scope="col" className="py-1.5 text-right">
              <span className="sr-only">Original</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {versions.map((v) => {
            const selected = v.id === selectedId;
            return (
              <tr key={v.id} className={`border-b border-paper-line/70 last:border-b-0 ${selected ? 'bg-accent-soft/50' : 'hover:bg-paper/70'}`}>
                <td className="py-1.5 pr-3">
                  <button
                    type="button"
                    onClick={() => onSelect(v.id)}
                    aria-current={selected || undefined}
                    className={`figures font-semibold ${selected ? 'text-ink' : 'text-accent hover:underline'}`}
                  >
                    {v.version}
                  </button>
                </td>
                <td className="max-w-[16rem] py-1.5 pr-3">
                  <span className="block truncate" title={v.originalName}>
                    {v.originalName}
                  </span>
                  <span className="figures block truncate text-[11px] text-ink-faint">
                    {formatBytes(v.size)} · {v.uploadedBy || 'unknown'} · {formatDateTime(v.createdAt)}
                  </span>
                </td>
                <td className="py-1.5 pr-3 whitespace-nowrap">{v.status === 'imported' ? <Badge tone="accent">Imported</Badge> : <Badge tone="danger">Needs options</Badge>}</td>
                <td className="figures py-1.5 pr-3 text-right">{v.status === 'imported' ? v.jointCount : '—'}</td>
                <td className="figures py-1.5 pr-3 text-right">{v.status === 'imported' ? v.memberCount : '—'}</td>
                <td className="py-1.5 pr-3 font-mono text-[11px] text-ink-soft" title={`SHA-256 ${v.sha256}`}>
                  {v.sha256.slice(0, 10)}
                </td>
                <td className="py-1.5 text-right">
                  <a href={drawingFileUrl(v.id)} download={v.originalName} className="text-xs font-medium text-accent hover:underline">
                    Original
                  </a>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
