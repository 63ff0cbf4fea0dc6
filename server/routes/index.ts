import { Router } from 'express';
import { getConfig } from '../config';
import { notFoundMiddleware } from '../middleware/notFound';
import { createAuditRouter } from './audit.routes';
import { createAuthRouter } from './auth.routes';
import { createHealthRouter } from './health.routes';
import { createOutboxRouter } from './outbox.routes';
import { createUsersRouter } from './users.routes';
import { createDesignsRouter } from './designs.routes';
import { createPartsRouter } from './parts.routes';
import { createCalcRouter } from './calc.routes';
import { createDesignFlowRouter } from './designFlow.routes';
import { createRevisionsRouter } from './revisions.routes';
import { createSheetsRouter } from './sheets.routes';
import { createAttachmentsRouter, createDesignAttachmentsRouter } from './attachments.routes';
import { createMeasurementsRouter } from './measurements.routes';
import { createTorqueCurvesRouter } from './torqueCurves.routes';
import { createDesignJobRouter } from './designJob.routes';

/**
 * The API router, mounted at /api. This is the one registration point: each feature adds one
 * `apiRouter.use('/<resource>', create<Resource>Router())` line below. Every route guards itself with
 * requireRole / requireMember (requireAuth alone only for the account's own profile and sessions).
 */
export function createApiRouter(): Router {
  const apiRouter = Router();
  apiRouter.use('/health', createHealthRouter());
  apiRouter.use('/auth', createAuthRouter());
  apiRouter.use('/users', createUsersRouter());
  apiRouter.use('/audit', createAuditRouter());
  if (!getConfig().isProduction) apiRouter.use('/outbox', createOutboxRouter());
  // Features register here, one line each.
  apiRouter.use('/designs', createDesignsRouter());
  apiRouter.use('/parts', createPartsRouter());
  apiRouter.use('/calc', createCalcRouter());
  apiRouter.use('/designs', createDesignFlowRouter());
  apiRouter.use('/revisions', createRevisionsRouter());
  apiRouter.use('/sheets', createSheetsRouter());
  apiRouter.use('/designs', createDesignAttachmentsRouter());
  apiRouter.use('/attachments', createAttachmentsRouter());
  apiRouter.use('/parts', createTorqueCurvesRouter());
  apiRouter.use('/sheets', createMeasurementsRouter());
  apiRouter.use('/designs', createDesignJobRouter());

  apiRouter.use(notFoundMiddleware());
  return apiRouter;
}
