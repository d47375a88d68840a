'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { resetRequestSchema } from '@/lib/schemas/account';
import { Field, inputClass, buttonClass } from '@/components/forms/field';
import { api } from '@/lib/api-client';

export default function ResetRequestPage() {
  const [sent, setSent] = useState(false);
  const [error, setError] = useState<string>();
  const form = useForm<z.input<typeof resetRequestSchema>>({ resolver: zodResolver(resetRequestSchema) });
  async function onSubmit(values: z.input<typeof resetRequestSchema>) {
    const res = await api.account.requestReset(values);
    if (res.ok) setSent(true);
    else setError(res.failure.error);
  }
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-2xl font-semibold">Reset your password</h1>
      {sent ? (
        <p role="status">If an account uses that address, a reset link is on its way. It is valid for 2 hours.</p>
      ) : (
        <form onSubmit={form.handleSubmit(onSubmit)} className="space-y-4" noValidate>
          <Field id="email" label="E-mail" required error={form.formState.errors.email?.message}>
            <input id="email" type="email" className={inputClass} {...form.register('email')} />
          </Field>
          {error ? <p role="alert" className="text-sm text-bad">{error}</p> : null}
          <button className={buttonClass}>Send the link</button>
        </form>
      )}
    </div>
  );
}
