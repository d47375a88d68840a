'use client';

import { use, useState } from 'react';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { resetConfirmSchema } from '@/lib/schemas/account';
import { Field, inputClass, buttonClass } from '@/components/forms/field';
import { api } from '@/lib/api-client';

type Values = z.input<typeof resetConfirmSchema>;

export default function ResetConfirmPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = use(params);
  const [done, setDone] = useState(false);
  const [error, setError] = useState<string>();
  const form = useForm<Values>({ resolver: zodResolver(resetConfirmSchema), defaultValues: { token } });
  async function onSubmit(values: Values) {
    const res = await api.account.confirmReset(values);
    if (res.ok) setDone(true);
    else setError(res.failure.error);
  }
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-2xl font-semibold">Choose a new password</h1>
      {done ? (
        <p role="status">Your password is changed and every session was signed out. <Link href="/signin" className="underline">Sign in</Link>.</p>
      ) : (
        <form onSubmit={form.handleSubmit(onSubmit)} className="space-y-4" noValidate>
          <input type="hidden" {...form.register('token')} />
          <Field id="password" label="New password" required error={form.formState.errors.password?.message} help="At least 10 characters.">
            <input id="password" type="password" autoComplete="new-password" className={inputClass} {...form.register('password')} />
          </Field>
          <p className="text-sm text-muted">Saving signs this account out on every browser and device.</p>
          <label className="flex items-start gap-2 text-sm">
            <input type="checkbox" className="mt-1" {...form.register('revokeTokens')} />
            <span>Also revoke all my API tokens (do this if someone else may have had access to the account)</span>
          </label>
          {error ? <p role="alert" className="text-sm text-bad">{error}</p> : null}
          <button className={buttonClass}>Save the password</button>
        </form>
      )}
    </div>
  );
}
