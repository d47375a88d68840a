'use client';

import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { registerSchema } from '@/lib/schemas/account';
import { Field, inputClass, buttonClass } from '@/components/forms/field';
import { api } from '@/lib/api-client';

type Values = z.input<typeof registerSchema>;

export function RegisterForm() {
  const [done, setDone] = useState<string>();
  const [error, setError] = useState<string>();
  const form = useForm<Values>({ resolver: zodResolver(registerSchema) });
  const errors = form.formState.errors;

  async function onSubmit(values: Values) {
    setError(undefined);
    const res = await api.account.register(values);
    if (res.ok) setDone(res.data.email);
    else setError(res.failure.error);
  }

  if (done) {
    return (
      <p role="status" className="rounded-card border border-ok p-3">
        Almost there: a message is on its way to {done}. Open the confirmation link in it, then sign in. (If that address already has an account, the message says so instead.)
      </p>
    );
  }
  return (
    <form onSubmit={form.handleSubmit(onSubmit)} className="space-y-4" noValidate>
      <Field id="name" label="Name" required error={errors.name?.message} help="Shown beside the curves you contribute.">
        <input id="name" className={inputClass} aria-invalid={!!errors.name} {...form.register('name')} />
      </Field>
      <Field id="email" label="E-mail" required error={errors.email?.message}>
        <input id="email" type="email" autoComplete="email" className={inputClass} aria-invalid={!!errors.email} {...form.register('email')} />
      </Field>
      <Field id="password" label="Password" required error={errors.password?.message} help="At least 10 characters.">
        <input id="password" type="password" autoComplete="new-password" className={inputClass} aria-invalid={!!errors.password} {...form.register('password')} />
      </Field>
      {error ? <p role="alert" className="text-sm text-bad">{error}</p> : null}
      <button className={buttonClass} disabled={form.formState.isSubmitting}>Create account</button>
    </form>
  );
}
