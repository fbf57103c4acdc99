import { useMemo } from 'react';
import katex from 'katex';
import 'katex/dist/katex.min.css';
import { breakableTex } from '@shared/text/breakable-tex';

/**
 * KaTeX source typeset in display style but as inline maths, so that a long equation or vector
 * wraps at its relations, operators, list commas and between words (breakableTex), as on the calc
 * sheet, instead of running out of its card; a formula KaTeX cannot read is shown as its source, in red.
 */
export function Tex({ source, label }: { source: string; label?: string }) {
  const html = useMemo(
    () => katex.renderToString(`\\displaystyle ${breakableTex(source)}`, { displayMode: false, throwOnError: false, output: 'htmlAndMathml' }),
    [source],
  );
  return <div className="my-1.5 min-w-0 text-[13px] leading-[2.1]" aria-label={label} dangerouslySetInnerHTML={{ __html: html }} />;
}
