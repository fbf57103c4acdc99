import { useCallback, useEffect, useRef, useState } from 'react';
import { stepAnchorAt, stepAnchorsIn, stepTitlesIn } from '../utils/step-anchor';

/** A request to bring one step into view; `seq` makes a second click on the same step scroll again. */
export interface StepFocus {
  anchor: string;
  seq: number;
}

interface SheetPreviewProps {
  src: string;
  /** Steps that carry threads: anchor → open thread count (0 when all are resolved). */
  commented: ReadonlyMap<string, number>;
  selected: string | null;
  focus: StepFocus | null;
  /** A click on a step; absent when the person may not comment. */
  onPickStep?: (anchor: string) => void;
  /** The sheet's anchors in document order, once it has loaded. */
  onAnchors?: (anchors: string[]) => void;
  /** Each anchor's heading on the sheet, once it has loaded. */
  onTitles?: (titles: Record<string, string>) => void;
  /** Steps that changed since the revision compared with: anchor → 'changed' or 'added'. */
  changed?: ReadonlyMap<string, 'changed' | 'added'>;
  /** Unchanged steps to fold (runs of them collapse behind a button with their count); null: fold nothing. */
  fold?: ReadonlySet<string> | null;
}

// Marks drawn into the sheet's own document: which steps can be clicked, carry threads, are chosen.
const PREVIEW_STYLE = `
  [data-pp-pickable] .step { cursor: pointer; }
  [data-pp-pickable] .step:hover { outline: 2px solid rgba(18, 96, 90, 0.28); outline-offset: 3px; }
  [data-pp-threads] { position: relative; box-shadow: -5px 0 0 -1px #8a8d90; }
  [data-pp-threads][data-pp-open] { box-shadow: -5px 0 0 -1px #a33a2b; }
  [data-pp-threads]::after {
    content: attr(data-pp-threads); position: absolute; top: 0; right: calc(100% + 9px); padding: 1px 5px; white-space: nowrap;
    font: 600 10px/1.4 Inter, 'Noto Sans', 'Noto Sans Arabic', 'Noto Sans Hebrew', 'Noto Sans Devanagari', 'Noto Sans SC', 'Noto Sans JP', 'Noto Sans KR', 'Noto Sans TC', 'Noto Sans Thai', system-ui, sans-serif; color: #55585c; background: #f3efe7; border-radius: 3px;
  }
  [data-pp-threads][data-pp-open]::after { color: #a33a2b; background: #faeeec; }
  [data-pp-selected] { outline: 2px solid #12605a !important; outline-offset: 3px; background-color: rgba(217, 235, 232, 0.35); }
  @keyframes pp-flash { from { background-color: rgba(217, 235, 232, 0.9); } to { background-color: transparent; } }
  [data-pp-flash] { animation: pp-flash 1.4s ease-out; }
  [data-pp-changed] { position: relative; background-color: rgba(219, 232, 228, 0.45); }
  [data-pp-changed]::before {
    content: attr(data-pp-changed); position: absolute; top: 0; right: 0; padding: 1px 6px;
    font: 600 10px/1.4 Inter, 'Noto Sans', system-ui, sans-serif; color: #fdfcf9; background: #0f5a55; border-radius: 2px;
  }
  [data-pp-folded] { display: none !important; }
  .pp-fold {
    display: block; width: 100%; margin: 2mm 0; padding: 4px 8px; text-align: left; cursor: pointer;
    font: 500 11px/1.4 Inter, 'Noto Sans', system-ui, sans-serif; color: #4f5357; background: #f4f1ea; border: 1px dashed #8a8275; border-radius: 2px;
  }
  .pp-fold:hover { color: #26292b; border-color: #4f5357; }
`;

/** "6.1–6.4" from the first and last printed numbers of a run of steps. */
function numberRange(steps: Element[]): string {
  const numbers = steps.map((el) => el.querySelector('.step-no')?.textContent?.trim()).filter((n): n is string => Boolean(n));
  if (numbers.length === 0) return '';
  return numbers.length === 1 ? numbers[0]! : `${numbers[0]}\u2013${numbers[numbers.length - 1]}`;
}

/** Opens the folded run a step lies in (the run's button stands just before its first step). */
function unfold(el: Element): void {
  if (!el.hasAttribute('data-pp-folded')) return;
  for (let prev = el.previousElementSibling; prev; prev = prev.previousElementSibling) {
    if (prev.classList.contains('pp-fold')) {
      (prev as HTMLButtonElement).click();
      return;
    }
  }
}

function threadLabel(open: number): string {
  return open > 0 ? `${open} open` : 'resolved';
}

type LoadState = { kind: 'loading' } | { kind: 'ready' } | { kind: 'missing'; message: string };

/**
 * The revision's calc sheet, in a same-origin frame, as the PDF will print it. Clicking a step
 * picks its anchor for a comment; steps with threads carry a mark in the margin.
 */
export function SheetPreview({ src, commented, selected, focus, onPickStep, onAnchors, onTitles, changed, fold }: SheetPreviewProps) {
  const frame = useRef<HTMLIFrameElement>(null);
  const [doc, setDoc] = useState<Document | null>(null);
  const [state, setState] = useState<LoadState>({ kind: 'loading' });
  const pick = useRef(onPickStep);
  pick.current = onPickStep;

  const handleLoad = useCallback(() => {
    const loaded = frame.current?.contentDocument;
    if (!loaded) return;
    // An error answer (JSON) or an empty page means no preview for this revision.
    if (loaded.contentType !== 'text/html' || !loaded.querySelector('[id]')) {
      let message = 'The calc sheet preview is not available for this revision yet.';
      try {
        const body = JSON.parse(loaded.body?.textContent ?? '') as { error?: { message?: string } };
        if (body.error?.message) message = body.error.message;
      } catch {
        // Not JSON: keep the plain sentence.
      }
      setDoc(null);
      setState({ kind: 'missing', message });
      return;
    }
    const style = loaded.createElement('style');
    style.textContent = PREVIEW_STYLE;
    loaded.head.append(style);
    loaded.addEventListener('click', (event) => {
      const target = event.target as Element | null;
      // In-sheet links would move the frame away from the sheet's top; the page scrolls instead.
      if (target?.closest('a[href^="#"]')) event.preventDefault();
      if (!pick.current) return;
      const anchor = stepAnchorAt(target);
      if (anchor) pick.current(anchor);
    });
    setDoc(loaded);
    setState({ kind: 'ready' });
    onAnchors?.(stepAnchorsIn(loaded));
    onTitles?.(stepTitlesIn(loaded));
  }, [onAnchors, onTitles]);

  useEffect(() => {
    if (!doc) return;
    if (onPickStep) doc.body.setAttribute('data-pp-pickable', '');
    else doc.body.removeAttribute('data-pp-pickable');
  }, [doc, onPickStep]);

  useEffect(() => {
    if (!doc) return;
    for (const el of doc.querySelectorAll('[data-pp-threads]')) {
      el.removeAttribute('data-pp-threads');
      el.removeAttribute('data-pp-open');
    }
    for (const [anchor, open] of commented) {
      const el = doc.getElementById(anchor);
      if (!el) continue;
      el.setAttribute('data-pp-threads', threadLabel(open));
      if (open > 0) el.setAttribute('data-pp-open', '');
    }
  }, [doc, commented]);

  useEffect(() => {
    if (!doc) return;
    for (const el of doc.querySelectorAll('[data-pp-selected]')) el.removeAttribute('data-pp-selected');
    if (selected) doc.getElementById(selected)?.setAttribute('data-pp-selected', '');
  }, [doc, selected]);

  useEffect(() => {
    if (!doc) return;
    for (const el of doc.querySelectorAll('[data-pp-changed]')) el.removeAttribute('data-pp-changed');
    for (const el of doc.querySelectorAll('[data-pp-folded]')) el.removeAttribute('data-pp-folded');
    for (const el of doc.querySelectorAll('.pp-fold')) el.remove();
    for (const [anchor, kind] of changed ?? []) doc.getElementById(anchor)?.setAttribute('data-pp-changed', kind === 'added' ? 'new step' : 'changed');
    if (!fold) return;
    // Runs of unchanged steps standing next to one another collapse behind one button each.
    let run: Element[] = [];
    const flush = () => {
      if (run.length === 0) return;
      const steps = run;
      run = [];
      const button = doc.createElement('button');
      button.type = 'button';
      button.className = 'pp-fold';
      button.setAttribute('data-pp-fold-count', String(steps.length));
      button.textContent = `${steps.length} unchanged step${steps.length === 1 ? '' : 's'} (${numberRange(steps)}) folded — show`;
      button.addEventListener('click', (event) => {
        // Not a pick of the section around it for a comment.
        event.stopPropagation();
        for (const step of steps) step.removeAttribute('data-pp-folded');
        button.remove();
      });
      steps[0]!.before(button);
      for (const step of steps) step.setAttribute('data-pp-folded', '');
    };
    for (const el of doc.querySelectorAll('article.step[id]')) {
      if (!fold.has(el.id)) {
        flush();
        continue;
      }
      if (run.length && run[run.length - 1]!.nextElementSibling !== el) flush();
      run.push(el);
    }
    flush();
  }, [doc, changed, fold]);

  useEffect(() => {
    if (!doc || !focus) return;
    const el = doc.getElementById(focus.anchor);
    if (!el) return;
    unfold(el);
    el.scrollIntoView({ block: 'start', behavior: 'smooth' });
    el.removeAttribute('data-pp-flash');
    void el.getBoundingClientRect();
    el.setAttribute('data-pp-flash', '');
  }, [doc, focus]);

  return (
    <div className="relative h-[78vh] min-h-[28rem] overflow-hidden rounded-xs border border-paper-line bg-paper-sunk">
      <iframe
        ref={frame}
        src={src}
        title="Calc sheet preview"
        onLoad={handleLoad}
        className={`size-full ${state.kind === 'missing' ? 'invisible' : ''}`}
      />
      {state.kind === 'loading' && (
        <div role="status" className="absolute top-3 left-3 flex items-center gap-2 rounded-xs border border-paper-line bg-paper-raised px-3 py-1.5 text-xs text-ink-soft shadow-sm">
          <span aria-hidden className="inline-block w-6 animate-pulse border-t-2 border-dashed border-accent" />
          Laying out the calc sheet…
        </div>
      )}
      {state.kind === 'missing' && (
        <div className="absolute inset-0 flex items-center justify-center p-8">
          <p className="max-w-sm text-center text-sm text-ink-soft">{state.message}</p>
        </div>
      )}
    </div>
  );
}
