import type { Metadata } from 'next';
import { RegisterForm } from './register-form';

export const metadata: Metadata = { title: 'Create an account' };

export default function RegisterPage() {
  return (
    <div className="mx-auto max-w-md space-y-6">
      <h1 className="text-2xl font-semibold">Create a contributor account</h1>
      <p className="text-sm text-muted">Anyone can search, model and download verified curves without an account. You need one to contribute curves and save optics.</p>
      <RegisterForm />
    </div>
  );
}
