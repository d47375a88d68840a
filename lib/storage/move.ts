import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { MAX_FILE_BYTES } from '@/lib/engine/reader/limits';
import { putRawIfAbsent, rawKey, readCapped } from './objects';

export type MoveReport = { moved: number; alreadyThere: number; refused: { id: number; reason: string }[] };

/**
 * Moves raw files kept in submission_files.content (before migration 0012) to the file store
 * at raw/<sha256>, a hundred rows at a time. A row is emptied only after the stored copy has
 * been read back and hashes to the row's sha256; a row whose own bytes do not match its hash
 * is left alone and reported. Runs as the schema owner (0012's guard lets only the owner empty
 * the column); running it again moves whatever is left, and nothing when nothing is.
 */
export async function moveRawFilesToStore(owner: Sequelize, batch = 100): Promise<MoveReport> {
  const report: MoveReport = { moved: 0, alreadyThere: 0, refused: [] };
  let after = 0;
  for (;;) {
    const rows = await owner.query<{ id: number; sha256: string; content: Buffer }>(
      `SELECT id, sha256, content FROM submission_files WHERE content IS NOT NULL AND id > :after ORDER BY id LIMIT :batch`,
      { replacements: { after, batch }, type: QueryTypes.SELECT },
    );
    if (rows.length === 0) return report;
    for (const row of rows) {
      after = row.id;
      if (createHash('sha256').update(row.content).digest('hex') !== row.sha256) {
        report.refused.push({ id: row.id, reason: 'its bytes do not hash to its sha256; left in the database' });
        continue;
      }
      const outcome = await putRawIfAbsent(row.sha256, row.content);
      const stored = await readCapped(rawKey(row.sha256), MAX_FILE_BYTES);
      if (!stored || 'tooLarge' in stored || stored.sha256 !== row.sha256) {
        report.refused.push({ id: row.id, reason: `the file store's raw/${row.sha256} does not hold these bytes; left in the database` });
        continue;
      }
      await owner.query(`UPDATE submission_files SET content = NULL WHERE id = :id AND content IS NOT NULL`, { replacements: { id: row.id } });
      if (outcome === 'stored') report.moved++;
      else report.alreadyThere++;
    }
  }
}
