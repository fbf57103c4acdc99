import { fn, col } from 'sequelize';
import { readRows } from '../../db/read-rows';
import type { ProjectView, TrussView } from '@shared/schemas/project.schema';
import { Project, Truss } from '../../db/models';
import { sqlDateIso } from '../../db/sql-dates';

/** A project row, as a model instance or as the raw row of a list query. */
type ProjectRow = Pick<Project, 'id' | 'name' | 'jobNumber' | 'client' | 'site' | 'designBasis' | 'unitSystem' | 'archived' | 'createdAt' | 'updatedAt'>;

function toProjectView(p: ProjectRow, trussCount: number): ProjectView {
  return {
    id: p.id,
    name: p.name,
    jobNumber: p.jobNumber,
    client: p.client,
    site: p.site,
    designBasis: p.designBasis,
    unitSystem: p.unitSystem,
    archived: Boolean(p.archived),
    createdAt: sqlDateIso(p.createdAt),
    updatedAt: sqlDateIso(p.updatedAt),
    trussCount,
  };
}

export function toTrussView(t: Truss): TrussView {
  return {
    id: t.id,
    projectId: t.projectId,
    name: t.name,
    createdAt: sqlDateIso(t.createdAt),
    updatedAt: sqlDateIso(t.updatedAt),
  };
}

async function trussCounts(projectIds: number[]): Promise<Map<number, number>> {
  if (projectIds.length === 0) return new Map();
  const rows = (await Truss.findAll({
    attributes: ['projectId', [fn('COUNT', col('id')), 'count']],
    where: { projectId: projectIds },
    group: ['projectId'],
    raw: true,
  })) as unknown as { projectId: number; count: number }[];
  return new Map(rows.map((r) => [r.projectId, Number(r.count)]));
}

export const projectsRepository = {
  async list(includeArchived: boolean): Promise<ProjectView[]> {
    // The list is read on every visit to the projects page: one hand-written query with the
    // truss counts joined in, plain rows (no model instances, no query building; bench:api).
    const rows = await readRows<ProjectRow & { trussCount: number | string }>(
      Project.sequelize!,
      `SELECT p."id", p."name", p."jobNumber", p."client", p."site", p."designBasis", p."unitSystem", p."archived", p."createdAt", p."updatedAt",
              COUNT(t."id") AS "trussCount"
         FROM "projects" p LEFT JOIN "trusses" t ON t."projectId" = p."id"
        ${includeArchived ? '' : 'WHERE p."archived" = :no'}
        GROUP BY p."id"
        ORDER BY p."updatedAt" DESC`,
      includeArchived ? {} : { no: false },
    );
    return rows.map((p) => toProjectView(p, Number(p.trussCount)));
  },
  async find(id: number): Promise<ProjectView | null> {
    const p = await Project.findByPk(id);
    if (!p) return null;
    const counts = await trussCounts([id]);
    return toProjectView(p, counts.get(id) ?? 0);
  },
  async create(values: Omit<ProjectView, 'id' | 'archived' | 'createdAt' | 'updatedAt' | 'trussCount'>, createdById: number) {
    const p = await Project.create({ ...values, createdById });
    return toProjectView(p, 0);
  },
  async update(id: number, values: Partial<Project['_creationAttributes']>): Promise<ProjectView | null> {
    const p = await Project.findByPk(id);
    if (!p) return null;
    await p.update(values);
    return this.find(id);
  },
  async listTrusses(projectId: number): Promise<TrussView[]> {
    const rows = await Truss.findAll({ where: { projectId }, order: [['name', 'ASC']] });
    return rows.map(toTrussView);
  },
  async createTruss(projectId: number, name: string): Promise<TrussView> {
    return toTrussView(await Truss.create({ projectId, name }));
  },
  async findTruss(id: number): Promise<TrussView | null> {
    const t = await Truss.findByPk(id);
    return t ? toTrussView(t) : null;
  },
};
