import { Router } from 'express';
import { Op } from 'sequelize';
import { roleCan } from '../../shared/api.js';
import { commentBody, requestReviewBody, verdictBody, type ReviewDto, type StatementReviewDto } from '../../shared/collaboration.js';
import type { ServerConfig } from '../config.js';
import type { Mailer } from '../mail/mailer.js';
import { reviewReplyMail, reviewRequestedMail, reviewVerdictMail } from '../mail/templates.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { forbidden, HttpError, notFound } from '../middleware/http-error.js';
import { idParam, parseInput, routeParam } from '../middleware/validate.js';
import { Membership, Review, ReviewComment, User, Worksheet } from '../models/index.js';
import { reviewableStatements } from '../reviews/fingerprint.js';
import { recordActivity } from '../activity/record.js';


const withPeople = [
  { model: User, as: 'reviewer' },
  { model: User, as: 'requestedBy' },
  { model: Worksheet, as: 'worksheet' },
  { model: ReviewComment, as: 'comments', include: [{ model: User, as: 'author' }] },
];

/** The review as the client sees it; stale when the current statement's fingerprint differs. */
function toDto(r: Review, currentFingerprints: Map<string, string>): ReviewDto {
  return {
    id: r.id,
    worksheetId: r.worksheetId,
    worksheetTitle: r.worksheet?.title ?? '',
    statementKey: r.statementKey,
    statementText: r.statementText,
    version: r.version,
    status: r.status,
    reviewer: r.reviewer?.displayName ?? 'a former member',
    reviewerId: r.reviewerId,
    requestedBy: r.requestedBy?.displayName ?? 'a former member',
    requestedAt: r.requestedAt.toISOString(),
    decidedAt: r.decidedAt?.toISOString() ?? null,
    stale: currentFingerprints.get(r.statementKey) !== r.fingerprint,
    comments: [...(r.comments ?? [])]
      .sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id - b.id)
      .map((c) => ({ id: c.id, author: c.author?.displayName ?? 'a former member', body: c.body, createdAt: c.createdAt.toISOString() })),
  };
}

const fingerprintsOf = (source: string) => new Map(reviewableStatements(source).map((s) => [s.key, s.fingerprint]));

async function loadReview(id: number): Promise<Review> {
  const review = await Review.findByPk(id, { include: withPeople });
  if (!review || !review.worksheet) throw notFound('This review');
  return review;
}

/** The statements of a source with their review state, for the screen and the exports. */
export async function statementReviews(worksheetId: number, source: string): Promise<StatementReviewDto[]> {
  const statements = reviewableStatements(source);
  const current = new Map(statements.map((s) => [s.key, s.fingerprint]));
  const reviews = await Review.findAll({ where: { worksheetId }, include: withPeople, order: [['requestedAt', 'DESC'], ['id', 'DESC']] });
  return statements.map((s) => {
    const mine = reviews.filter((r) => r.statementKey === s.key).map((r) => toDto(r, current));
    const fresh = mine.find((r) => !r.stale && r.status !== 'requested') ?? mine.find((r) => !r.stale);
    return { key: s.key, line: s.line, text: s.text, status: fresh?.status ?? 'unreviewed', reviews: mine };
  });
}

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
    const statement = reviewableStatements(worksheet.source).find((s) => s.key === body.statementKey);
    if (!statement) throw new HttpError(400, 'no_such_statement', `The current version has no statement “${body.statementKey}”. Save first, then ask for review.`);
    const members = await Membership.findAll({ where: { groupId: worksheet.groupId, userId: body.reviewerIds }, include: [{ model: User, as: 'user' }] });
    for (const reviewerId of body.reviewerIds) {
      const m = members.find((x) => x.userId === reviewerId);
      if (!m || !roleCan(m.role, 'review')) {
        throw new HttpError(400, 'not_a_reviewer', 'Each chosen person must be a reviewer (or owner) of this group. Pick reviewers from the member list.');
      }
    }
    const created = await Review.sequelize!.transaction(async (transaction) => {
      const rows: Review[] = [];
      for (const m of members) {
        rows.push(
          await Review.create(
            { worksheetId: id, statementKey: statement.key, statementText: statement.text, version: worksheet.version, fingerprint: statement.fingerprint, requestedById: user.id, reviewerId: m.userId },
            { transaction },
          ),
        );
        await mailer.send(reviewRequestedMail({ to: m.user!.email, requester: user.displayName, worksheet: worksheet.title, statement: statement.key, link: link(id) }), { transaction });
      }
      await recordActivity(Review.sequelize!, { groupId: worksheet.groupId, userId: user.id, action: 'requested review', subject: `${statement.key} in ${worksheet.title}`, worksheetId: id }, transaction);
      return rows;
    });
    const current = fingerprintsOf(worksheet.source);
    const loaded = await Promise.all(created.map((r) => loadReview(r.id)));
    res.status(201).json({ reviews: loaded.map((r) => toDto(r, current)) });
  });

  // The assigned reviewer confirms or disputes, with a comment.
  router.post('/reviews/:reviewId/verdict', async (req, res) => {
    const user = currentUser(req);
    const review = await loadReview(idParam(routeParam(req, 'reviewId'), 'This review'));
    await requireGroupRole(user.id, review.worksheet!.groupId, 'review');
    if (review.reviewerId !== user.id) throw forbidden('Only the reviewer this review was asked of can give its verdict.');
    const body = parseInput(verdictBody, req.body);
    if (body.verdict === 'disputed' && !body.comment) throw new HttpError(400, 'invalid_input', 'comment: Say what is wrong when you dispute a result.');
    await Review.sequelize!.transaction(async (transaction) => {
      await review.update({ status: body.verdict, decidedAt: new Date() }, { transaction });
      if (body.comment) await ReviewComment.create({ reviewId: review.id, authorId: user.id, body: body.comment }, { transaction });
      await recordActivity(Review.sequelize!, { groupId: review.worksheet!.groupId, userId: user.id, action: body.verdict, subject: `${review.statementKey} in ${review.worksheet!.title}`, worksheetId: review.worksheetId }, transaction);
      if (review.requestedBy) {
        await mailer.send(
          reviewVerdictMail({
            to: review.requestedBy.email,
            reviewer: user.displayName,
            verdict: body.verdict,
            worksheet: review.worksheet!.title,
            statement: review.statementKey,
            comment: body.comment,
            link: link(review.worksheetId),
          }),
          { transaction },
        );
      }
    });
    const fresh = await loadReview(review.id);
    res.json({ review: toDto(fresh, fingerprintsOf(fresh.worksheet!.source)) });
  });

  // A reply in the thread; everyone who takes part hears of it, except its author.
  router.post('/reviews/:reviewId/comments', async (req, res) => {
    const user = currentUser(req);
    const review = await loadReview(idParam(routeParam(req, 'reviewId'), 'This review'));
    const role = await requireGroupRole(user.id, review.worksheet!.groupId, 'read');
    if (!roleCan(role, 'review') && !roleCan(role, 'editWorksheets')) throw forbidden('Readers can follow review threads but not write in them.');
    const body = parseInput(commentBody, req.body);
    await Review.sequelize!.transaction(async (transaction) => {
      await ReviewComment.create({ reviewId: review.id, authorId: user.id, body: body.body }, { transaction });
      await recordActivity(Review.sequelize!, { groupId: review.worksheet!.groupId, userId: user.id, action: 'commented', subject: `on ${review.statementKey} in ${review.worksheet!.title}`, worksheetId: review.worksheetId }, transaction);
      const ids = new Set([review.requestedById, review.reviewerId, ...(review.comments ?? []).map((c) => c.authorId)].filter((x): x is number => x != null && x !== user.id));
      const people = await User.findAll({ where: { id: [...ids] }, transaction });
      for (const p of people) {
        await mailer.send(
          reviewReplyMail({ to: p.email, author: user.displayName, worksheet: review.worksheet!.title, statement: review.statementKey, body: body.body, link: link(review.worksheetId) }),
          { transaction },
        );
      }
    });
    const fresh = await loadReview(review.id);
    res.status(201).json({ review: toDto(fresh, fingerprintsOf(fresh.worksheet!.source)) });
  });

  // The signed-in reviewer's queue: what they were asked and have not answered.
  router.get('/review-queue', async (req, res) => {
    const user = currentUser(req);
    const reviews = await Review.findAll({ where: { reviewerId: user.id, status: 'requested' }, include: withPeople, order: [['requestedAt', 'ASC']] });
    res.json({ reviews: reviews.map((r) => toDto(r, fingerprintsOf(r.worksheet!.source))) });
  });

  // A group's reviews, newest first.
  router.get('/groups/:groupId/reviews', async (req, res) => {
    const groupId = idParam(routeParam(req, 'groupId'), 'This group');
    await requireGroupRole(currentUser(req).id, groupId, 'read');
    const sheets = await Worksheet.findAll({ where: { groupId }, attributes: ['id'] });
    const reviews = await Review.findAll({
      where: { worksheetId: { [Op.in]: sheets.map((s) => s.id) } },
      include: withPeople,
      order: [['requestedAt', 'DESC'], ['id', 'DESC']],
      limit: 500,
    });
    res.json({ reviews: reviews.map((r) => toDto(r, fingerprintsOf(r.worksheet!.source))) });
  });

  return router;
}
