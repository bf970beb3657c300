import { Router } from 'express';
import { roleCan } from '../../shared/api.js';
import { commentBody, requestReviewBody, verdictBody } from '../../shared/collaboration.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { forbidden, HttpError } from '../middleware/http-error.js';
import { idParam, parseInput, routeParam } from '../middleware/validate.js';
import { addComment, findStatement, giveVerdict, groupReviews, loadReview, membersOf, pendingReviewCount, requestReviews, reviewQueue, statementReviews } from '../services/reviews.js';

export function reviewRoutes(config: ServerConfig, mailer: Mailer): Router {
  const router = Router();
  const link = (worksheetId: number) => `${config.publicUrl}/worksheets/${worksheetId}`;

  // Each statement of the current version with its reviews (newest first).
  router.get('/worksheets/:id/reviews', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    res.json({ version: worksheet.version, statements: await statementReviews(worksheet.id, worksheet.source) });
  });

  // An author asks chosen reviewers to review one statement of the current version.
  router.post('/worksheets/:id/reviews', async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const body = parseInput(requestReviewBody, req.body);
    const statement = findStatement(worksheet.source, body.statementKey);
    if (!statement) throw new HttpError(400, 'no_such_statement', `The current version has no statement “${body.statementKey}”. Save first, then ask for review.`);
    const members = await membersOf(worksheet.groupId, body.reviewerIds);
    for (const reviewerId of body.reviewerIds) {
      const m = members.find((x) => x.userId === reviewerId);
      if (!m || !roleCan(m.role, 'review')) {
        throw new HttpError(400, 'not_a_reviewer', 'Each chosen person must be a reviewer (or owner) of this group. Pick reviewers from the member list.');
      }
    }
    const reviews = await requestReviews({ worksheet, statement, requester: user, reviewers: members, mailer, link: link(id) });
    res.status(201).json({ reviews });
  });

  // The assigned reviewer confirms or disputes, with a comment.
  router.post('/reviews/:reviewId/verdict', async (req, res) => {
    const user = currentUser(req);
    const review = await loadReview(idParam(routeParam(req, 'reviewId'), 'This review'));
    await requireGroupRole(user.id, review.worksheet!.groupId, 'review');
    if (review.reviewerId !== user.id) throw forbidden('Only the reviewer this review was asked of can give its verdict.');
    const body = parseInput(verdictBody, req.body);
    if (body.verdict === 'disputed' && !body.comment) throw new HttpError(400, 'invalid_input', 'comment: Say what is wrong when you dispute a result.');
    res.json({ review: await giveVerdict({ review, reviewer: user, verdict: body.verdict, comment: body.comment, mailer, link: link(review.worksheetId) }) });
  });

  // A reply in the thread.
  router.post('/reviews/:reviewId/comments', async (req, res) => {
    const user = currentUser(req);
    const review = await loadReview(idParam(routeParam(req, 'reviewId'), 'This review'));
    const role = await requireGroupRole(user.id, review.worksheet!.groupId, 'read');
    if (!roleCan(role, 'review') && !roleCan(role, 'editWorksheets')) throw forbidden('Readers can follow review threads but not write in them.');
    const body = parseInput(commentBody, req.body);
    res.status(201).json({ review: await addComment({ review, author: user, body: body.body, mailer, link: link(review.worksheetId) }) });
  });

  // The signed-in reviewer's queue: what they were asked and have not answered.
  router.get('/review-queue', async (req, res) => {
    res.json({ reviews: await reviewQueue(currentUser(req).id) });
  });

  // How many reviews wait for the signed-in person: the count in the top bar.
  router.get('/review-queue/count', async (req, res) => {
    res.set('cache-control', 'no-store').json({ count: await pendingReviewCount(currentUser(req).id) });
  });

  // A group's reviews, newest first.
  router.get('/groups/:groupId/reviews', async (req, res) => {
    const groupId = idParam(routeParam(req, 'groupId'), 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    res.json({ reviews: await groupReviews(groupId) });
  });

  return router;
}
