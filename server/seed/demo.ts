import bcrypt from 'bcryptjs';
import type { Role } from '@shared/schemas/auth.schema';
import { Firm, Project, Truss, User } from '../db/models';
import type { FileStore } from '../storage/file-store';
import { uploadDrawing } from '../modules/drawings/drawings.service';
import { importInline } from '../modules/drawings/import-read';
import { demoTrussDxf } from './demo-drawing';

/** Demo password shared by the four demo accounts. For local use only. */
export const DEMO_PASSWORD = 'panelpoint-demo';

export const DEMO_USERS: { email: string; name: string; role: Role }[] = [
  { email: 'drafter@demo.panelpoint.test', name: 'Dana Whitlock', role: 'drafter' },
  { email: 'engineer@demo.panelpoint.test', name: 'Eli Marsh', role: 'engineer' },
  { email: 'reviewer@demo.panelpoint.test', name: 'Rosa Quint', role: 'reviewer' },
  { email: 'admin@demo.panelpoint.test', name: 'Ada Fenn', role: 'admin' },
];

/**
 * An invented firm and a warehouse-roof project, loaded only into an empty database so a
 * new install has something to sign in to.
 */
export async function seedDemo(bcryptRounds: number, uploads: FileStore): Promise<boolean> {
  if ((await User.count()) > 0) return false;
  await Firm.upsert({
    id: 1,
    name: 'Harrow & Vale Structural (demo)',
    address: '14 Cooper Lane, Millbrook',
    paperSize: 'A4',
  });
  const hash = await bcrypt.hash(DEMO_PASSWORD, bcryptRounds);
  const users = await Promise.all(DEMO_USERS.map((u) => User.create({ ...u, passwordHash: hash })));
  const engineer = users.find((u) => u.role === 'engineer')!;
  const project = await Project.create({
    name: 'Kestrel Logistics — warehouse roof',
    jobNumber: 'HV-2417',
    client: 'Kestrel Logistics Ltd (demo)',
    site: 'Unit 3, Fieldgate Trading Estate',
    designBasis:
      'Timber pitched roof trusses at 4.5 m centres over a 12 m clear span. Loads and combinations per the governing local code; demo data only.',
    unitSystem: 'SI',
    createdById: engineer.id,
  });
  const t1 = await Truss.create({ projectId: project.id, name: 'T1 — typical interior truss' });
  await Truss.create({ projectId: project.id, name: 'T2 — gable end truss' });

  // T1 arrives with its drawing, uploaded by the demo drafter, as the start of the journeys.
  const drafter = users.find((u) => u.role === 'drafter')!;
  const bytes = Buffer.from(demoTrussDxf(), 'latin1');
  await uploadDrawing(
    { trussId: t1.id, file: { bytes, originalName: 'KL-T1-roof-truss.dxf' }, fields: { layers: '["CHORDS","WEBS"]' }, userId: drafter.id },
    // Our own drawing: read on this thread, before the app's import workers exist.
    { store: uploads, pool: importInline() },
  );
  return true;
}
