'use client';

import { useState } from 'react';
import type { ColumnDef } from '@tanstack/react-table';
import { DataTable } from '@/components/table/data-table';
import { api, type UserAccessChange } from '@/lib/api-client';

export type UserRow = { id: string; name: string; email: string; role: string; disabled: boolean; confirmed: boolean; createdAt: string };

export function UsersTable({ rows: initial, selfId }: { rows: UserRow[]; selfId: string }) {
  const [rows, setRows] = useState(initial);
  const [message, setMessage] = useState<string>();

  async function change(id: string, body: UserAccessChange) {
    const res = await api.admin.changeUser(id, body);
    if (!res.ok) return setMessage(res.failure.error);
    setRows((rs) => rs.map((r) => (r.id === id ? { ...r, role: res.data.role, disabled: res.data.disabled } : r)));
    setMessage('Saved.');
  }

  const columns: ColumnDef<UserRow, unknown>[] = [
    { accessorKey: 'name', header: 'Name' },
    { accessorKey: 'email', header: 'E-mail' },
    {
      accessorKey: 'role', header: 'Role',
      cell: ({ row }) => (
        <select aria-label={`Role of ${row.original.email}`} value={row.original.role} disabled={row.original.id === selfId}
          onChange={(e) => change(row.original.id, { role: e.target.value as UserAccessChange['role'] })} className="rounded-card border border-rule bg-panel px-2 py-1">
          <option value="contributor">contributor</option>
          <option value="moderator">moderator</option>
          <option value="admin">admin</option>
        </select>
      ),
    },
    { accessorKey: 'confirmed', header: 'E-mail confirmed', cell: ({ getValue }) => (getValue() ? 'yes' : 'not yet') },
    {
      accessorKey: 'disabled', header: 'Access',
      cell: ({ row }) => (
        <button type="button" disabled={row.original.id === selfId} onClick={() => change(row.original.id, { disabled: !row.original.disabled })}
          className="rounded-card border border-rule px-2 py-1 disabled:opacity-40" aria-label={`${row.original.disabled ? 'Enable' : 'Disable'} ${row.original.email}`}>
          {row.original.disabled ? '⛔ disabled — enable' : 'active — disable'}
        </button>
      ),
    },
    { accessorKey: 'createdAt', header: 'Joined', cell: ({ getValue }) => String(getValue()).slice(0, 10) },
  ];
  return (
    <div className="space-y-2">
      {message ? <p role="status" className="text-sm">{message}</p> : null}
      <DataTable data={rows} columns={columns} caption="Users" pageSize={20} />
    </div>
  );
}
