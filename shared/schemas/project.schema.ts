import { z } from 'zod';

export const unitSystemSchema = z.enum(['SI', 'US'], { error: 'Choose the units: SI or US.' });
export type UnitSystem = z.infer<typeof unitSystemSchema>;

const projectFields = {
  name: z.string().trim().min(1, 'Enter a project name, e.g. "Riverside depot roof".').max(160, 'Shorten the project name to 160 characters or fewer.'),
  jobNumber: z.string().trim().min(1, 'Enter the job number, e.g. 24-031.').max(40, 'Shorten the job number to 40 characters or fewer.'),
  client: z.string().trim().max(160, 'Shorten the client to 160 characters or fewer.'),
  site: z.string().trim().max(240, 'Shorten the site to 240 characters or fewer.'),
  designBasis: z.string().trim().max(2000, 'Shorten the design basis to 2000 characters or fewer.'),
  unitSystem: unitSystemSchema,
};

export const projectInputSchema = z.object({
  ...projectFields,
  client: projectFields.client.default(''),
  site: projectFields.site.default(''),
  designBasis: projectFields.designBasis.default(''),
  unitSystem: projectFields.unitSystem.default('SI'),
});
export type ProjectInput = z.input<typeof projectInputSchema>;

/** Only the fields sent change; no defaults here, or a rename would blank the rest. */
export const projectUpdateSchema = z
  .object({ ...projectFields, archived: z.boolean() })
  .partial()
  .refine((v) => Object.values(v).some((x) => x !== undefined), 'Nothing to change: send at least one field.');
export type ProjectUpdate = z.input<typeof projectUpdateSchema>;

export interface ProjectView {
  id: number;
  name: string;
  jobNumber: string;
  client: string;
  site: string;
  designBasis: string;
  unitSystem: UnitSystem;
  archived: boolean;
  createdAt: string;
  updatedAt: string;
  trussCount: number;
}

export const trussInputSchema = z.object({
  name: z.string().trim().min(1, 'Enter a truss name, e.g. "T1 – typical interior truss".').max(160, 'Shorten the truss name to 160 characters or fewer.'),
});
export type TrussInput = z.infer<typeof trussInputSchema>;

export interface TrussView {
  id: number;
  projectId: number;
  name: string;
  createdAt: string;
  updatedAt: string;
}

export const paperSizeSchema = z.enum(['A4', 'Letter'], { error: 'Choose the paper size: A4 or Letter.' });
export const firmSettingsSchema = z.object({
  name: z.string().trim().min(1, 'Enter the firm name, as it should read on every sheet.').max(160, 'Shorten the firm name to 160 characters or fewer.'),
  address: z.string().trim().max(400, 'Shorten the address to 400 characters or fewer.').default(''),
  paperSize: paperSizeSchema.default('A4'),
});
export type FirmSettings = z.infer<typeof firmSettingsSchema>;
