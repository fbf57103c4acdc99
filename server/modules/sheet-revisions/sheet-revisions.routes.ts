import type { Request } from 'express';
import { newSheetCommentSchema, newSheetRevisionSchema, sheetCheckerSchema, sheetCommentResolveSchema, sheetSubmitSchema, sheetTransitionSchema, type SheetAction } from '@shared/schemas/review.schema';
import { ANY_ROLE, ApiRoutes, type RouteSpec } from '../../middleware/access';
import { idParam, validateBody } from '../../middleware/validate';
import * as review from './sheet-revisions.service';
import * as comments from './sheet-comments.service';
import { revisionSheetHtml } from './revision-preview';
import { compareRevisions } from './revision-compare.service';
import { AppError } from '../../errors/app-error';

const actorOf = (req: Request): review.Actor => ({ id: req.user!.id, name: req.user!.name, role: req.user!.role });

/** Sheet revisions: starting one, its status moves, its preview and its comments. */
export function sheetRevisionsRoutes(registry: RouteSpec[], deps: review.ReviewServiceDeps) {
  const routes = new ApiRoutes('/api', registry);

  routes.add('get', '/trusses/:id/sheets', ANY_ROLE, async (req, res) => {
    res.json(await review.listTrussRevisions(idParam(req.params.id, 'That truss')));
  });
  routes.add('post', '/trusses/:id/sheets', ['engineer'], validateBody(newSheetRevisionSchema), async (req, res) => {
    const trussId = idParam(req.params.id, 'That truss');
    res.status(201).json(await review.createRevision({ trussId, runId: req.body.runId, note: req.body.note }, actorOf(req), deps));
  });
  routes.add('get', '/sheets/:id', ANY_ROLE, async (req, res) => {
    res.json(await review.getRevision(idParam(req.params.id, 'That sheet revision'), deps));
  });
  routes.add('get', '/sheets/:id/compare', ANY_ROLE, async (req, res) => {
    const id = idParam(req.params.id, 'That sheet revision');
    const raw = req.query.with;
    let withId: number | undefined;
    if (raw !== undefined) {
      withId = typeof raw === 'string' && /^[1-9][0-9]{0,15}$/.test(raw) ? Number(raw) : NaN;
      if (!Number.isSafeInteger(withId)) {
        throw new AppError('bad-compare-with', '"with" must be the id of another sheet revision of this truss, a whole number (e.g. ?with=12).', 422);
      }
    }
    res.json(await compareRevisions(id, withId));
  });
  routes.add('get', '/sheets/:id/preview', ANY_ROLE, async (req, res) => {
    res.type('html').send(await revisionSheetHtml(idParam(req.params.id, 'That sheet revision'), deps.publicUrl));
  });

  routes.add('get', '/checkers', ['engineer', 'admin'], async (req, res) => {
    res.json(await review.listCheckers(actorOf(req)));
  });
  routes.add('post', '/sheets/:id/submit', ['engineer'], validateBody(sheetSubmitSchema), async (req, res) => {
    const id = idParam(req.params.id, 'That sheet revision');
    res.json(await review.transitionRevision(id, 'submit', req.body.note, actorOf(req), deps, { checkerId: req.body.checkerId }));
  });
  routes.add('post', '/sheets/:id/checker', ['admin'], validateBody(sheetCheckerSchema), async (req, res) => {
    res.json(await review.reassignChecker(idParam(req.params.id, 'That sheet revision'), req.body.checkerId, req.body.note, actorOf(req), deps));
  });

  const transition = (action: SheetAction, who: readonly ('engineer' | 'reviewer')[]) =>
    routes.add('post', `/sheets/:id/${action}`, who, validateBody(sheetTransitionSchema), async (req, res) => {
      res.json(await review.transitionRevision(idParam(req.params.id, 'That sheet revision'), action, req.body.note, actorOf(req), deps));
    });
  transition('return', ['reviewer']);
  transition('check', ['reviewer']);
  transition('issue', ['engineer']);

  routes.add('post', '/sheets/:id/comments', ['engineer', 'reviewer'], validateBody(newSheetCommentSchema), async (req, res) => {
    res.status(201).json(await comments.addComment(idParam(req.params.id, 'That sheet revision'), req.body, actorOf(req), deps));
  });
  routes.add('patch', '/sheet-comments/:id', ['engineer', 'reviewer'], validateBody(sheetCommentResolveSchema), async (req, res) => {
    res.json(await comments.resolveComment(idParam(req.params.id, 'That comment'), req.body.resolved, actorOf(req), deps));
  });
  return routes.router;
}
