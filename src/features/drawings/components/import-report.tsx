import type { DxfReportEntry } from '@shared/dxf-import';
import { reportEntryHasPlaces } from '../utils/report-highlight';

/**
 * What each entry is, said first in a word and carried by the rule at its left (line style
 * before colour, docs/visual-language.md): read is a thin faint line, repaired a solid accent
 * line, check a double line in the compression brown.
 */
const SEVERITY: Record<DxfReportEntry['severity'], { word: string; tone: string; rule: string }> = {
  info: { word: 'Read', tone: 'text-ink-soft', rule: 'border-l border-l-ink-faint' },
  change: { word: 'Repaired', tone: 'text-accent', rule: 'border-l-2 border-l-accent' },
  warning: { word: 'Check', tone: 'text-compression', rule: 'border-l-[4px] border-double border-l-compression' },
};

function sentence(message: string): string {
  return message.charAt(0).toUpperCase() + message.slice(1) + (/[.!?]$/.test(message) ? '' : '.');
}

interface ImportReportProps {
  entries: DxfReportEntry[];
  /** Index of the chosen entry in `entries`, or null. */
  selected: number | null;
  onSelect: (index: number | null) => void;
}

/**
 * The import report, one line per entry, styled by what it is: what was read, what
 * repairing the geometry changed, what needs a look. Entries with places can be chosen to show them in the drawing.
 */
export function ImportReport({ entries, selected, onSelect }: ImportReportProps) {
  const warnings = entries.filter((e) => e.severity === 'warning').length;
  const changes = entries.filter((e) => e.severity === 'change').length;
  return (
    <div>
      <p className="figures mb-3 text-xs text-ink-soft">
        {warnings === 0 ? 'Nothing to check' : `${warnings} to check`} · {changes === 0 ? 'geometry needed no repair' : `geometry repaired in ${changes} ${changes === 1 ? 'place' : 'places'}`}
        {entries.some(reportEntryHasPlaces) && ' · choose a line to see it in the drawing'}
      </p>
      <ol className="flex flex-col gap-1.5" aria-label="Import report">
        {entries.map((entry, i) => {
          const style = SEVERITY[entry.severity];
          const locatable = reportEntryHasPlaces(entry);
          const isSelected = selected === i;
          const body = (
            <>
              <span className="flex items-center gap-2">
                <span className={`text-[12px] leading-4 font-semibold ${style.tone}`}>{style.word}</span>
                {entry.count > 1 && entry.severity !== 'info' && <span className="figures text-[11px] text-ink-faint">× {entry.count}</span>}
                {locatable && <span className={`ml-auto text-[11px] ${isSelected ? 'text-accent' : 'text-ink-faint'}`}>{isSelected ? 'Shown' : 'Show'}</span>}
              </span>
              <span className="figures mt-0.5 block text-[13px] leading-snug text-ink">{sentence(entry.message)}</span>
            </>
          );
          const frame = `block w-full px-2.5 py-1.5 text-left ${style.rule}`;
          return (
            <li key={`${entry.kind}-${i}`}>
              {locatable ? (
                <button
                  type="button"
                  aria-pressed={isSelected}
                  onClick={() => onSelect(isSelected ? null : i)}
                  className={`${frame} transition-colors ${isSelected ? 'bg-accent-soft/70 outline outline-1 outline-accent' : 'hover:bg-paper-sunk/70'}`}
                >
                  {body}
                </button>
              ) : (
                <div className={frame}>{body}</div>
              )}
            </li>
          );
        })}
      </ol>
    </div>
  );
}
