'use client';

import { useState } from 'react';
import Link from 'next/link';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { signIn } from 'next-auth/react';
import { z } from '@/lib/schemas/zod';
import { signInSchema, resetRequestSchema } from '@/lib/schemas/account';
import { Field, inputClass, buttonClass } from '@/components/forms/field';

const ERRORS: Record<string, string> = {
  CredentialsSignin: 'That e-mail and password do not match an account.',
  RateLimited: 'Too many failed attempts; wait 15 minutes or reset your password.',
  AccountDisabled: 'This account is disabled; contact an administrator.',
  EmailNotConfirmed: 'Confirm your e-mail address first: open the link we sent you.',
  LinkRateLimited: 'Too many sign-in links were asked for; try again in an hour, or sign in with your password.',
};

export function SignInForms({ callbackUrl }: { callbackUrl: string }) {
  const [error, setError] = useState<string>();
  const form = useForm<z.input<typeof signInSchema>>({ resolver: zodResolver(signInSchema) });
  const linkForm = useForm<z.input<typeof resetRequestSchema>>({ resolver: zodResolver(resetRequestSchema) });

  async function onPassword(values: z.input<typeof signInSchema>) {
    setError(undefined);
    const res = await signIn('credentials', { ...values, redirect: false, callbackUrl });
    if (!res || res.error) {
      setError(ERRORS[res?.error ?? ''] ?? 'Sign-in failed; try again.');
      return;
    }
    window.location.assign(res.url ?? callbackUrl);
  }

  async function onLink(values: z.input<typeof resetRequestSchema>) {
    setError(undefined);
    const res = await signIn('email', { email: values.email, callbackUrl, redirect: false });
    if (!res || res.error) {
      setError(ERRORS[res?.error ?? ''] ?? 'The link could not be sent; try again.');
      return;
    }
    window.location.assign('/signin/check-mail');
  }

  return (
    <div className="space-y-8">
      <form onSubmit={form.handleSubmit(onPassword)} className="space-y-4" noValidate aria-label="Sign in with password">
        <Field id="email" label="E-mail" required error={form.formState.errors.email?.message}>
          <input id="email" type="email" autoComplete="email" className={inputClass} aria-invalid={!!form.formState.errors.email} {...form.register('email')} />
        </Field>
        <Field id="password" label="Password" required error={form.formState.errors.password?.message}>
          <input id="password" type="password" autoComplete="current-password" className={inputClass} aria-invalid={!!form.formState.errors.password} {...form.register('password')} />
        </Field>
        {error ? <p role="alert" className="text-sm text-bad">{error}</p> : null}
        <div className="flex items-center gap-4">
          <button className={buttonClass} disabled={form.formState.isSubmitting}>Sign in</button>
          <Link href="/reset-password" className="text-sm underline">Forgot the password?</Link>
        </div>
      </form>
      <form onSubmit={linkForm.handleSubmit(onLink)} className="space-y-3 border-t border-rule pt-6" noValidate aria-label="Sign in with an e-mail link">
        <h2 className="font-medium">Or get a sign-in link by e-mail</h2>
        <Field id="link-email" label="E-mail" error={linkForm.formState.errors.email?.message}>
          <input id="link-email" type="email" className={inputClass} {...linkForm.register('email')} />
        </Field>
        <button className="rounded-card border border-rule px-4 py-2" disabled={linkForm.formState.isSubmitting}>Send me a link</button>
      </form>
      <p className="text-sm">
        New here? <Link href="/register" className="underline">Create a contributor account</Link>.
      </p>
    </div>
  );
}
