import { isoMinute } from './format';
import type { SheetSection } from './context';
import { signatureFields } from './signatures';
import { qrSvg } from '../verify-qr';
import { FOOT_SHARES, frameFontPt, frameWidthMm, HEAD_SHARES, FOOT_SIZES, HEAD_SIZES, footHeightMm, HEAD_HEIGHT_MM, FRAME_LINE_HEIGHT, type FrameBox } from './page-frame';
import type { CalcSheetInput } from './types';

/** The frame of every page: paper, document title, units, the title block and its signatures. */
export const titleBlockSection: SheetSection<'paper' | 'documentTitle' | 'unstable' | 'units' | 'titleBlock' | 'generatedAt' | 'issue'> = {
  build({ input, fmt, system, unstable }) {
    const { project } = input;
    const { preparedBy, preparedDate, checkedBy, checkedDate, issuedBy, issuedDate } = signatureFields(input);
    const addressLines = input.firm.address.split(/\s*\n\s*/).map((l) => l.trim()).filter(Boolean);
    const run = input.runLabel ?? '';
    const frame = pageFrame(input, { addressLines, preparedBy, preparedDate, checkedBy, checkedDate, run, generatedAt: isoMinute(input.generatedAt) });
    return {
      view: {
        paper: input.firm.paperSize,
        // Chromium writes the <title> as the PDF's Title, the one metadata field it embeds: an
        // altered copy is told which issued sheet it claims to be from it (records/pdf-claim.ts).
        documentTitle: `${project.jobNumber} ${input.subject} — rev ${input.revision}${
          input.issue ? ` — issued sheet ${input.issue.sheetId}, fingerprint ${input.issue.fingerprint}` : ''
        }`,
        unstable,
        units: {
          system: system === 'us' ? 'US customary' : 'SI',
          force: fmt.unit('force'),
          length: fmt.unit('length'),
          ...(system === 'us'
            ? { note: 'Tables and drawings are in US customary units; the joint-by-joint equations are written in kN and m, the units the analysis computes in (1 kip = 4.448 kN, 1 ft = 0.3048 m).' }
            : {}),
        },
        titleBlock: {
          firm: input.firm.name,
          firmAddress: input.firm.address.replace(/\s*\n\s*/g, ', '),
          project: project.name,
          jobNumber: project.jobNumber,
          subject: input.subject,
          revision: input.revision,
          preparedBy,
          preparedDate,
          checkedBy,
          checkedDate,
          issuedBy,
          issuedDate,
          run,
          firmAddressLines: addressLines,
          ...frame,
        },
        generatedAt: isoMinute(input.generatedAt),
        issue: input.issue
          ? { ...input.issue, revision: input.revision, qrSvg: qrSvg(input.issue.verifyUrl) }
          : null,
      },
    };
  },
};

/** Type sizes of the page head and footer for this sheet's texts (see page-frame.ts). */
function pageFrame(
  input: CalcSheetInput,
  t: { addressLines: string[]; preparedBy: string; preparedDate: string; checkedBy: string; checkedDate: string; run: string; generatedAt: string },
): { headPt: number; footPt: number } {
  const width = frameWidthMm(input.firm.paperSize);
  const head: FrameBox[] = [
    { share: HEAD_SHARES.left, lines: [input.firm.name, ...t.addressLines] },
    { share: HEAD_SHARES.right, lines: [`Job ${input.project.jobNumber} · ${input.project.name}`, input.subject, `Sheet 999 of 999 · Revision ${input.revision}`] },
  ];
  const issue = input.issue;
  const foot: FrameBox[] = [
    {
      share: FOOT_SHARES.left,
      lines: [
        `Prepared by ${t.preparedBy}, ${t.preparedDate}      ·      Checked by ${t.checkedBy}, ${t.checkedDate}`,
        ...(issue ? [`Issued sheet ${issue.sheetId}  ·  revision ${input.revision}  ·  fingerprint ${issue.fingerprint} (of the issue record, not of this PDF file)`] : []),
      ],
    },
    { share: FOOT_SHARES.right, lines: [`Panelpoint · ${t.run} · ${t.generatedAt}`, ...(issue ? [`Verify at ${issue.verifyUrl}`] : [])] },
  ];
  return {
    headPt: frameFontPt(head, width, HEAD_HEIGHT_MM, HEAD_SIZES, FRAME_LINE_HEIGHT),
    footPt: frameFontPt(foot, width, footHeightMm(Boolean(issue)), FOOT_SIZES, FRAME_LINE_HEIGHT),
  };
}
