import type { FirmSettings } from '@shared/schemas/project.schema';
import { Firm } from '../../db/models';

const DEFAULT_FIRM: FirmSettings = { name: 'Your firm', address: '', paperSize: 'A4' };

/** The firm's title-block details; one row, made on first read. */
export async function getFirm(): Promise<FirmSettings> {
  const firm = await Firm.findByPk(1);
  if (!firm) return DEFAULT_FIRM;
  return { name: firm.name, address: firm.address, paperSize: firm.paperSize };
}

export async function saveFirm(input: FirmSettings): Promise<FirmSettings> {
  await Firm.upsert({ id: 1, ...input });
  return getFirm();
}
