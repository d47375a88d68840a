import type { MigrationContext } from '../migrator';
import foundation from './0001_foundation';
import catalogue from './0002_catalogue';
import catalogueVersion from './0003_catalogue_version';
import mailQueueSessions from './0004_mail_queue_sessions';
import appRoleAndGuards from './0005_app_role_and_guards';
import coating from './0006_coating';
import rateLimits from './0007_rate_limits';
import catalogueChanges from './0009_catalogue_changes';
import curvePageReads from './0010_curve_page_reads';
import polarisedNeff from './0011_polarised_neff';
import rawFilesInBucket from './0012_raw_files_in_bucket';
import catalogueUnits from './0013_catalogue_units';

export type Migration = {
  name: string;
  up: (ctx: MigrationContext) => Promise<void>;
  down: (ctx: MigrationContext) => Promise<void>;
};

// Append new migrations here, in order; never edit one that has shipped.
export const migrations: Migration[] = [foundation, catalogue, catalogueVersion, mailQueueSessions, appRoleAndGuards, coating, rateLimits, catalogueChanges, curvePageReads, polarisedNeff, rawFilesInBucket, catalogueUnits];
