// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { stepAnchorAt, stepAnchorsIn, stepLabel, stepTitlesIn } from './step-anchor';

// A cut-down sheet in the shape templates/partials/{case-results,step}.hbs print.
const SHEET = `
  <section class="sheet-section case" id="case-D">
    <h3 id="case-D-reactions">Support reactions</h3>
    <article class="step step-joint" id="case-D/joint-C">
      <h4><a class="anchor" href="#case-D/joint-C"><span class="step-no">6.3</span> Joint C</a></h4>
      <div class="step-body has-fbd"><figure class="fbd-figure"><svg><defs><marker id="arrow-head"></marker></defs><path id="p1"></path></svg></figure>
      <div class="eqs"><div class="eq"><span class="katex">ΣF</span></div></div></div>
    </article>
    <p class="loose">Text in the section</p>
  </section>
  <p class="outside">Outside</p>`;

function sheet(): Document {
  const doc = document.implementation.createHTMLDocument('sheet');
  doc.body.innerHTML = SHEET;
  return doc;
}

describe('stepAnchorAt', () => {
  it('when a click lands deep inside a worked step (in its drawing), then the step’s id is the anchor, not the drawing’s', () => {
    const doc = sheet();
    expect(stepAnchorAt(doc.getElementById('p1'))).toBe('case-D/joint-C');
    expect(stepAnchorAt(doc.querySelector('.katex'))).toBe('case-D/joint-C');
  });

  it('when a click lands in a section outside any step, then the section is the anchor', () => {
    const doc = sheet();
    expect(stepAnchorAt(doc.querySelector('.loose'))).toBe('case-D');
  });

  it('when a click lands outside every anchored part, then there is no anchor', () => {
    expect(stepAnchorAt(sheet().querySelector('.outside'))).toBeNull();
  });
});

describe('stepAnchorsIn', () => {
  it('when the sheet is read, then its anchors come in document order without the drawings’ internal ids', () => {
    expect(stepAnchorsIn(sheet())).toEqual(['case-D', 'case-D-reactions', 'case-D/joint-C']);
  });
});

describe('stepTitlesIn and stepLabel', () => {
  it('when the sheet has loaded, then comments are labelled with the headings the sheet prints, not ids', () => {
    const titles = stepTitlesIn(sheet());
    expect(titles).toEqual({ 'case-D-reactions': 'Support reactions', 'case-D/joint-C': '6.3 Joint C' });
    expect(stepLabel('case-D/joint-C', titles)).toBe('6.3 Joint C (case D)');
    expect(stepLabel('case-D-reactions', titles)).toBe('Support reactions');
  });

  it('when an anchor has no heading on the sheet, then its id stands in', () => {
    expect(stepLabel('case-D', stepTitlesIn(sheet()))).toBe('case-D');
  });
});
