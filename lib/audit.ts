import type { Transaction } from 'sequelize';
import { db } from '@/db/models';

// One row per thing that changed who can do what, or what the library holds.
export async function audit(
  actorId: string | null,
  action: string,
  target: { type?: string; id?: string | number } = {},
  detail: Record<string, unknown> = {},
  transaction?: Transaction,
): Promise<void> {
  const { AuditEvent } = db();
  await AuditEvent.create(
    { actorId, action, targetType: target.type ?? null, targetId: target.id === undefined ? null : String(target.id), detail },
    { transaction },
  );
}
