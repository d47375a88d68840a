'use client';

import { signOut } from 'next-auth/react';

export function SignOutButton() {
  return (
    <button type="button" className="underline underline-offset-4 hover:text-accent" onClick={() => signOut({ callbackUrl: '/' })}>
      Sign out
    </button>
  );
}
