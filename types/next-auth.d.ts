import type { Role } from '@/db/models/user';

declare module 'next-auth' {
  interface Session {
    user?: { id: string; name: string | null; email: string | null; role: Role };
  }
  interface User {
    role?: Role;
  }
}

declare module 'next-auth/jwt' {
  interface JWT {
    role?: Role;
    disabled?: boolean;
    /** The server-side session this cookie names (lib/auth/sessions.ts). */
    sid?: string;
  }
}
