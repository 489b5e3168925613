import type { SessionUser } from '@spincycle/shared/accounts/account-schemas';

declare global {
  namespace Express {
    // passport puts the signed-in account here.
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends SessionUser {}
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
    /** When the session was first stored (epoch ms): the start of its absolute lifetime. */
    createdAt?: number;
  }
}

export {};
