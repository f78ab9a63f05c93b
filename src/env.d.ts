/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** The signed-in person, set by src/middleware.ts; null on public routes without a session. */
    user: import("./server/auth/sessionUser").SessionUser | null;
    /** How the person authenticated: a session cookie or an API token. */
    authVia: "session" | "token" | null;
  }
}
