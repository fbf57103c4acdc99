// Step anchors follow the comment schema's rule: the step id as printed on the sheet.
const ANCHOR = /^[A-Za-z0-9][A-Za-z0-9._:/-]*$/;
// Parts of the sheet a comment can point at; ids inside drawings (SVG defs) are not steps.
const ANCHORED = 'article[id], section[id], table[id], h3[id], figure[id]';

/** Whether an element id can be a comment's step anchor. */
export function isStepAnchor(id: string): boolean {
  return id.length > 0 && id.length <= 200 && ANCHOR.test(id);
}

/**
 * The step a click on the sheet landed in: the nearest enclosing worked step (`.step` with an
 * id) or, outside steps, the nearest element whose id is an anchor (a section, a table).
 * Null when the click was outside every anchored part of the sheet.
 */
export function stepAnchorAt(target: Element | null): string | null {
  if (!target) return null;
  const step = target.closest('.step[id]');
  if (step && isStepAnchor(step.id)) return step.id;
  for (let el: Element | null = target.closest(ANCHORED); el; el = el.parentElement?.closest(ANCHORED) ?? null) {
    if (isStepAnchor(el.id)) return el.id;
  }
  return null;
}

/** Every anchored step and section of the sheet, in document order. */
export function stepAnchorsIn(doc: Document): string[] {
  return [...doc.querySelectorAll(ANCHORED)].map((el) => el.id).filter(isStepAnchor);
}
