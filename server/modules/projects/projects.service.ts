import type { ProjectView, TrussView } from '@shared/schemas/project.schema';
import { projectInputSchema, projectUpdateSchema, trussInputSchema } from '@shared/schemas/project.schema';
import { AppError, notFound } from '../../errors/app-error';
import type { z } from 'zod';
import { projectsRepository as repo } from './projects.repository';

export async function listProjects(includeArchived: boolean): Promise<ProjectView[]> {
  return repo.list(includeArchived);
}

export async function getProject(id: number): Promise<ProjectView> {
  const project = await repo.find(id);
  if (!project) throw notFound('That project');
  return project;
}

export async function createProject(input: z.output<typeof projectInputSchema>, userId: number): Promise<ProjectView> {
  return repo.create(input, userId);
}

export async function updateProject(id: number, input: z.output<typeof projectUpdateSchema>): Promise<ProjectView> {
  const updated = await repo.update(id, input);
  if (!updated) throw notFound('That project');
  return updated;
}

export async function listTrusses(projectId: number): Promise<TrussView[]> {
  await getProject(projectId);
  return repo.listTrusses(projectId);
}

export async function createTruss(projectId: number, input: z.output<typeof trussInputSchema>): Promise<TrussView> {
  const project = await getProject(projectId);
  if (project.archived) {
    throw new AppError('project-archived', 'This project is archived. Unarchive it before adding trusses.', 409);
  }
  return repo.createTruss(projectId, input.name);
}

export async function getTruss(id: number): Promise<TrussView> {
  const truss = await repo.findTruss(id);
  if (!truss) throw notFound('That truss');
  return truss;
}
