import { useMemo } from 'react';
import katex from 'katex';
import 'katex/dist/katex.min.css';

/** KaTeX source typeset as display maths; a formula KaTeX cannot read is shown as its source, in red. */
export function Tex({ source, label }: { source: string; label?: string }) {
  const html = useMemo(() => katex.renderToString(source, { displayMode: true, throwOnError: false, output: 'htmlAndMathml' }), [source]);
  return <div className="overflow-x-auto text-[13px] [&_.katex-display]:my-1.5 [&_.katex-display>.katex]:text-left" aria-label={label} dangerouslySetInnerHTML={{ __html: html }} />;
}
