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

/**
 * What a person calls each anchored part of the sheet: a step's heading ("Joint F",
 * "Moments about joint F") or a section's, so comments read in the sheet's words rather than
 * as ids. Anchors without a heading keep their id.
 */
export function stepTitlesIn(doc: Document): Record<string, string> {
  const titles: Record<string, string> = {};
  for (const el of doc.querySelectorAll(ANCHORED)) {
    if (!isStepAnchor(el.id)) continue;
    const heading = el.matches('.step')
      ? (el.querySelector('h4 a.anchor') ?? el.querySelector('h4'))
      : el.matches('h2, h3, h4')
        ? el
        : // A heading with an id of its own is a part of its own, not this one's title.
          el.querySelector(':scope > h2:not([id]), :scope > h3:not([id]), :scope > h4:not([id]), :scope > caption, :scope > figcaption');
    const text = heading?.textContent?.replace(/\s+/g, ' ').trim();
    if (text) titles[el.id] = text;
  }
  return titles;
}

/** A step's title for people, with the load case when the anchor names one ("case-D/…"). */
export function stepLabel(anchor: string, titles: Readonly<Record<string, string>>): string {
  const title = titles[anchor];
  if (!title) return anchor;
  const loadCase = /^case-([^/]+)\//.exec(anchor)?.[1];
  return loadCase && !title.includes(loadCase) ? `${title} (case ${loadCase})` : title;
}
