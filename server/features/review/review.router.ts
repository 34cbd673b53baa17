import express, { Router, type Request } from 'express';
import { SurveyParamsSchema } from '../../../shared/schemas/home';
import { DecisionsInputSchema, ImportQuerySchema, ReopenInputSchema } from '../../../shared/schemas/review';
import { auditContextOf } from '../../lib/audit-context';
import { AppError } from '../../lib/errors';
import { EVERY_ROLE, type AuthGuards } from '../../middleware/auth';
import { validate, validated } from '../../middleware/validate';
import type { createReadingsCsv } from './readings-csv';
import { REVIEW_ROLES, SUBMIT_ROLES, type ReviewActor, type ReviewService } from './review.service';

const OneInput = { params: SurveyParamsSchema };
const DecideInput = { params: SurveyParamsSchema, body: DecisionsInputSchema };
const ReopenInput = { params: SurveyParamsSchema, body: ReopenInputSchema };
const ImportInput = { params: SurveyParamsSchema, query: ImportQuerySchema };

/** Largest CSV accepted by the import. */
export const IMPORT_CSV_LIMIT = '10mb';

function actorOf(req: Request): ReviewActor {
  return { organisationId: req.membership!.organisationId, userId: req.user!.id, role: req.membership!.role };
}

/** Mounted at /api. */
export default function reviewRouter(deps: { review: ReviewService; csv: ReturnType<typeof createReadingsCsv>; guards: AuthGuards }): Router {
  const { review, csv, guards } = deps;
  const router = Router();
  const reviewers = [guards.requireUser, guards.requireMember(REVIEW_ROLES)];
  const members = [guards.requireUser, guards.requireMember(EVERY_ROLE)];

  router.get('/orgs/:orgId/surveys/:surveyId/review/readings', ...reviewers, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await review.readings(params.orgId, params.surveyId));
  });

  router.post('/orgs/:orgId/surveys/:surveyId/decisions', ...reviewers, validate(DecideInput), async (req, res) => {
    const { params, body } = validated(req, DecideInput);
    res.json(await review.decide(actorOf(req), params.surveyId, body, auditContextOf(req)));
  });

  router.post('/orgs/:orgId/surveys/:surveyId/submit', guards.requireUser, guards.requireMember(SUBMIT_ROLES), validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await review.submit(actorOf(req), params.surveyId, auditContextOf(req)));
  });

  router.post('/orgs/:orgId/surveys/:surveyId/sign-off', ...reviewers, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await review.signOff(actorOf(req), params.surveyId, auditContextOf(req)));
  });

  router.post('/orgs/:orgId/surveys/:surveyId/reopen', ...reviewers, validate(ReopenInput), async (req, res) => {
    const { params, body } = validated(req, ReopenInput);
    res.json(await review.reopen(actorOf(req), params.surveyId, body.reason, auditContextOf(req)));
  });

  router.get('/orgs/:orgId/surveys/:surveyId/report', ...members, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    res.json(await review.report(params.orgId, params.surveyId));
  });

  router.get('/orgs/:orgId/surveys/:surveyId/exports/readings.csv', ...members, validate(OneInput), async (req, res) => {
    const { params } = validated(req, OneInput);
    const out = await csv.exportCsv(params.orgId, params.surveyId);
    res.set('Content-Type', 'text/csv; charset=utf-8; header=present');
    res.set('Content-Disposition', `attachment; filename="${out.filename}"`);
    res.send(out.csv);
  });

  router.post(
    '/orgs/:orgId/surveys/:surveyId/imports/readings',
    ...reviewers,
    express.text({ type: ['text/csv', 'text/plain', 'application/csv'], limit: IMPORT_CSV_LIMIT }),
    validate(ImportInput),
    async (req, res) => {
      const { params, query } = validated(req, ImportInput);
      if (typeof req.body !== 'string') throw new AppError('UNSUPPORTED_MEDIA_TYPE', 'Send the CSV file as the request body with Content-Type: text/csv.');
      if (req.body.trim() === '') throw new AppError('VALIDATION_FAILED', 'The file is empty.', { issues: [{ in: 'body', path: '', message: 'The file is empty.' }] });
      res.json(await csv.importCsv(params.orgId, params.surveyId, req.body, query.mode, auditContextOf(req)));
    },
  );

  return router;
}
