/// <reference types="astro/client" />

type Role = import('./lib/contract').Role;

interface SessionUser {
  id: number;
  email: string;
  name: string;
  role: Role;
}

declare namespace App {
  interface Locals {
    user: SessionUser | null;
    /** The server-side session of the signed-in user (src/lib/server/sessions.ts). */
    sessionId: string | null;
  }
}
