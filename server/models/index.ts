import type { Sequelize } from 'sequelize';
import { Evaluation } from './evaluation.js';
import { Group } from './group.js';
import { Invitation } from './invitation.js';
import { PasswordReset } from './password-reset.js';
import { Review } from './review.js';
import { ReviewComment } from './review-comment.js';
import { Membership } from './membership.js';
import { User } from './user.js';
import { Worksheet } from './worksheet.js';
import { WorksheetVersion } from './worksheet-version.js';

export { Evaluation, Review, ReviewComment, Group, Invitation, Membership, PasswordReset, User, Worksheet, WorksheetVersion };

/** Registers every model and its associations on the Sequelize instance. */
export function initModels(sequelize: Sequelize): void {
  User.initModel(sequelize);
  Group.initModel(sequelize);
  Membership.initModel(sequelize);
  Worksheet.initModel(sequelize);
  WorksheetVersion.initModel(sequelize);
  Invitation.initModel(sequelize);
  Evaluation.initModel(sequelize);
  Review.initModel(sequelize);
  ReviewComment.initModel(sequelize);
  PasswordReset.initModel(sequelize);

  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Membership.belongsTo(Group, { foreignKey: 'groupId', as: 'group' });
  Group.hasMany(Membership, { foreignKey: 'groupId', as: 'memberships' });
  User.hasMany(Membership, { foreignKey: 'userId', as: 'memberships' });
  Worksheet.belongsTo(Group, { foreignKey: 'groupId', as: 'group' });
  Worksheet.belongsTo(User, { foreignKey: 'updatedById', as: 'updatedBy' });
  Group.hasMany(Worksheet, { foreignKey: 'groupId', as: 'worksheets' });
  WorksheetVersion.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  Worksheet.hasMany(WorksheetVersion, { foreignKey: 'worksheetId', as: 'versions' });
  Invitation.belongsTo(User, { foreignKey: 'invitedById', as: 'invitedBy' });
  Invitation.belongsTo(Group, { foreignKey: 'groupId', as: 'group' });
  Review.belongsTo(User, { foreignKey: 'reviewerId', as: 'reviewer' });
  Review.belongsTo(User, { foreignKey: 'requestedById', as: 'requestedBy' });
  Review.belongsTo(Worksheet, { foreignKey: 'worksheetId', as: 'worksheet' });
  Review.hasMany(ReviewComment, { foreignKey: 'reviewId', as: 'comments' });
  ReviewComment.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
}
