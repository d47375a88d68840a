import { AsyncLocalStorage } from 'node:async_hooks';
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
function primary() {
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

/*
 * Catalogue reads on the streaming replica. A Sequelize model class belongs to one connection,
 * so the replica gets subclasses of the four models a catalogue read touches (curves, their
 * contributors, public reviews, the optics a reader may pick), with the associations those reads follow. Inside onReplica(),
 * db() answers with them (and the replica's connection), so the catalogue's services run
 * unchanged on either database; everything else, and everything outside the scope, stays on the
 * primary. Scope and models live on globalThis: the server and Next's bundle load this module apart.
 */
type ReplicaModels = { sequelize: Sequelize; User: typeof User; Curve: typeof Curve; Review: typeof Review; Optic: typeof Optic };
const shared = globalThis as unknown as { bandconeReplicaScope?: AsyncLocalStorage<ReplicaModels>; bandconeReplicaModels?: WeakMap<Sequelize, ReplicaModels> };
const scope = (shared.bandconeReplicaScope ??= new AsyncLocalStorage<ReplicaModels>());
const replicaModels = (shared.bandconeReplicaModels ??= new WeakMap());

function bindReplica(sequelize: Sequelize): ReplicaModels {
  let m = replicaModels.get(sequelize);
  if (!m) {
    class ReplicaUser extends User {}
    class ReplicaCurve extends Curve {}
    class ReplicaReview extends Review {}
    class ReplicaOptic extends Optic {}
    ReplicaUser.initModel(sequelize);
    ReplicaOptic.initModel(sequelize);
    ReplicaCurve.initModel(sequelize);
    ReplicaReview.initModel(sequelize);
    ReplicaCurve.belongsTo(ReplicaUser, { foreignKey: 'contributorId', as: 'contributor' });
    ReplicaCurve.belongsTo(ReplicaCurve, { foreignKey: 'replacesCurveId', as: 'replaces' });
    ReplicaReview.belongsTo(ReplicaUser, { foreignKey: 'authorId', as: 'author' });
    m = { sequelize, User: ReplicaUser, Curve: ReplicaCurve, Review: ReplicaReview, Optic: ReplicaOptic };
    replicaModels.set(sequelize, m);
  }
  return m;
}

/** Runs `read` with db() answering from the replica's connection `sequelize`. */
export function onReplica<T>(sequelize: Sequelize, read: () => Promise<T>): Promise<T> {
  return scope.run(bindReplica(sequelize), read);
}

/** Whether the caller runs inside onReplica(). */
export function readingReplica(): boolean {
  return scope.getStore() !== undefined;
}

export function db() {
  const models = primary();
  const replica = scope.getStore();
  return replica ? { ...models, ...replica } : models;
}
