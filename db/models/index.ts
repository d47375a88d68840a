import type { Sequelize } from 'sequelize';
import { getSequelize } from '../connection';
import { User } from './user';
import { Account } from './account';
import { Session } from './session';
import { VerificationToken } from './verification-token';
import { UserToken } from './user-token';
import { ApiToken } from './api-token';
import { Optic } from './optic';
import { Submission } from './submission';
import { SubmissionFile } from './submission-file';
import { Curve } from './curve';
import { Review } from './review';
import { AuditEvent } from './audit-event';
import { MailMessage } from './mail-message';

export { User, Account, Session, VerificationToken, UserToken, ApiToken, Optic, Submission, SubmissionFile, Curve, Review, AuditEvent, MailMessage };

const initialised = new WeakSet<Sequelize>();

function associate() {
  User.hasMany(Account, { foreignKey: 'userId' });
  Account.belongsTo(User, { foreignKey: 'userId' });
  User.hasMany(Session, { foreignKey: 'userId' });
  Session.belongsTo(User, { foreignKey: 'userId' });
  User.hasMany(ApiToken, { foreignKey: 'userId' });
  ApiToken.belongsTo(User, { foreignKey: 'userId' });
  User.hasMany(Optic, { foreignKey: 'ownerId' });
  Optic.belongsTo(User, { foreignKey: 'ownerId', as: 'owner' });
  Submission.belongsTo(User, { foreignKey: 'contributorId', as: 'contributor' });
  Submission.hasMany(SubmissionFile, { foreignKey: 'submissionId', as: 'files' });
  SubmissionFile.belongsTo(Submission, { foreignKey: 'submissionId' });
  Submission.hasMany(Curve, { foreignKey: 'submissionId', as: 'curves' });
  Curve.belongsTo(Submission, { foreignKey: 'submissionId' });
  Curve.belongsTo(User, { foreignKey: 'contributorId', as: 'contributor' });
  Curve.belongsTo(Curve, { foreignKey: 'replacesCurveId', as: 'replaces' });
  Submission.hasMany(Review, { foreignKey: 'submissionId', as: 'reviews' });
  Review.belongsTo(Submission, { foreignKey: 'submissionId' });
  Review.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  AuditEvent.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
}

// Models bind to the process's one connection the first time anyone asks for them.
export function db() {
  const sequelize = getSequelize();
  if (!initialised.has(sequelize)) {
    for (const model of [User, Account, Session, VerificationToken, UserToken, ApiToken, Optic, Submission, SubmissionFile, Curve, Review, AuditEvent, MailMessage]) {
      model.initModel(sequelize);
    }
    associate();
    initialised.add(sequelize);
  }
  return { sequelize, User, Account, Session, VerificationToken, UserToken, ApiToken, Optic, Submission, SubmissionFile, Curve, Review, AuditEvent, MailMessage };
}
