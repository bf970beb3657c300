/** Queries of reviews and their comments; a review's staleness comes from the statement fingerprints. */
import { Op } from 'sequelize';
import type { ReviewDto, StatementReviewDto } from '../../shared/collaboration.js';
import type { Mailer } from '../mail/mailer.js';
import { reviewReplyMail, reviewRequestedMail, reviewVerdictMail } from '../mail/templates.js';
import { notFound } from '../middleware/http-error.js';
import { Membership, Review, ReviewComment, User, Worksheet } from '../models/index.js';
import { reviewableStatements, type ReviewableStatement } from '../reviews/fingerprint.js';
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

/** Reviews as DTOs, each worksheet's source fingerprinted once. */
function toDtos(reviews: Review[]): ReviewDto[] {
  const bySource = new Map<string, Map<string, string>>();
  return reviews.map((r) => {
    const source = r.worksheet!.source;
    let current = bySource.get(source);
    if (!current) bySource.set(source, (current = new Map(reviewableStatements(source).map((s) => [s.key, s.fingerprint]))));
    return toDto(r, current);
  });
}

/** A review with its people, worksheet and thread. */
export async function loadReview(id: number): Promise<Review> {
  const review = await Review.findByPk(id, { include: withPeople });
  if (!review || !review.worksheet) throw notFound('This review');
  return review;
}

export const reviewDto = async (id: number): Promise<ReviewDto> => toDtos([await loadReview(id)])[0]!;

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

export const findStatement = (source: string, key: string): ReviewableStatement | undefined => reviewableStatements(source).find((s) => s.key === key);

export const membersOf = (groupId: number, userIds: number[]) => Membership.findAll({ where: { groupId, userId: userIds }, include: [{ model: User, as: 'user' }] });

/** One review per chosen member, each told by mail, in one transaction. */
export async function requestReviews(o: { worksheet: Worksheet; statement: ReviewableStatement; requester: User; reviewers: Membership[]; mailer: Mailer; link: string }): Promise<ReviewDto[]> {
  const { worksheet, statement, requester } = o;
  const created = await Review.sequelize!.transaction(async (transaction) => {
    const rows: Review[] = [];
    for (const m of o.reviewers) {
      rows.push(
        await Review.create(
          { worksheetId: worksheet.id, statementKey: statement.key, statementText: statement.text, version: worksheet.version, fingerprint: statement.fingerprint, requestedById: requester.id, reviewerId: m.userId },
          { transaction },
        ),
      );
      await o.mailer.send(reviewRequestedMail({ to: m.user!.email, requester: requester.displayName, worksheet: worksheet.title, statement: statement.key, link: o.link }), { transaction });
    }
    await recordActivity(Review.sequelize!, { groupId: worksheet.groupId, userId: requester.id, action: 'requested review', subject: `${statement.key} in ${worksheet.title}`, worksheetId: worksheet.id }, transaction);
    return rows;
  });
  return toDtos(await Promise.all(created.map((r) => loadReview(r.id))));
}

/** The reviewer's verdict with an optional comment; the requester is told. */
export async function giveVerdict(o: { review: Review; reviewer: User; verdict: 'confirmed' | 'disputed'; comment: string; mailer: Mailer; link: string }): Promise<ReviewDto> {
  const { review, reviewer } = o;
  await Review.sequelize!.transaction(async (transaction) => {
    await review.update({ status: o.verdict, decidedAt: new Date() }, { transaction });
    if (o.comment) await ReviewComment.create({ reviewId: review.id, authorId: reviewer.id, body: o.comment }, { transaction });
    await recordActivity(Review.sequelize!, { groupId: review.worksheet!.groupId, userId: reviewer.id, action: o.verdict, subject: `${review.statementKey} in ${review.worksheet!.title}`, worksheetId: review.worksheetId }, transaction);
    if (review.requestedBy) {
      await o.mailer.send(
        reviewVerdictMail({ to: review.requestedBy.email, reviewer: reviewer.displayName, verdict: o.verdict, worksheet: review.worksheet!.title, statement: review.statementKey, comment: o.comment, link: o.link }),
        { transaction },
      );
    }
  });
  return reviewDto(review.id);
}

/** A reply in the thread; everyone who takes part hears of it, except its author. */
export async function addComment(o: { review: Review; author: User; body: string; mailer: Mailer; link: string }): Promise<ReviewDto> {
  const { review, author } = o;
  await Review.sequelize!.transaction(async (transaction) => {
    await ReviewComment.create({ reviewId: review.id, authorId: author.id, body: o.body }, { transaction });
    await recordActivity(Review.sequelize!, { groupId: review.worksheet!.groupId, userId: author.id, action: 'commented', subject: `on ${review.statementKey} in ${review.worksheet!.title}`, worksheetId: review.worksheetId }, transaction);
    const ids = new Set([review.requestedById, review.reviewerId, ...(review.comments ?? []).map((c) => c.authorId)].filter((x): x is number => x != null && x !== author.id));
    const people = await User.findAll({ where: { id: [...ids] }, transaction });
    for (const p of people) {
      await o.mailer.send(reviewReplyMail({ to: p.email, author: author.displayName, worksheet: review.worksheet!.title, statement: review.statementKey, body: o.body, link: o.link }), { transaction });
    }
  });
  return reviewDto(review.id);
}

/** What a reviewer was asked and has not answered, oldest first. */
export const reviewQueue = async (reviewerId: number) =>
  toDtos(await Review.findAll({ where: { reviewerId, status: 'requested' }, include: withPeople, order: [['requestedAt', 'ASC']] }));

/** How many reviews wait for this reviewer's verdict (in groups that still exist and where they may still review). */
export const pendingReviewCount = (reviewerId: number) =>
  Review.count({ where: { reviewerId, status: 'requested' }, include: [{ model: Worksheet, as: 'worksheet', required: true, attributes: [] }] });

/** A group's reviews, newest first. */
export async function groupReviews(groupId: number): Promise<ReviewDto[]> {
  const sheets = await Worksheet.findAll({ where: { groupId }, attributes: ['id'] });
  const reviews = await Review.findAll({
    where: { worksheetId: { [Op.in]: sheets.map((s) => s.id) } },
    include: withPeople,
    order: [['requestedAt', 'DESC'], ['id', 'DESC']],
    limit: 500,
  });
  return toDtos(reviews);
}
