import { isoMinute } from './format';
import type { SheetSection } from './context';
import { signatureFields } from './signatures';

/** The frame of every page: paper, document title, units, the title block and its signatures. */
export const titleBlockSection: SheetSection<'paper' | 'documentTitle' | 'unstable' | 'units' | 'titleBlock' | 'generatedAt'> = {
  build({ input, fmt, system, unstable }) {
    const { project } = input;
    const { preparedBy, preparedDate, checkedBy, checkedDate, issuedBy, issuedDate } = signatureFields(input);
    return {
      view: {
        paper: input.firm.paperSize,
        documentTitle: `${project.jobNumber} ${input.subject} — rev ${input.revision}`,
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
          run: input.runLabel ?? '',
        },
        generatedAt: isoMinute(input.generatedAt),
      },
    };
  },
};
