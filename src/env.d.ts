/// <reference types="astro/client" />

declare namespace App {
  interface Locals {
    /** Set by src/middleware.ts when a valid session names an active user. */
    user?: import('./lib/session-user').SessionUser;
    /** Correlates the log lines and audit events of one request. */
    requestId: string;
  }
}
