import type { Member } from './policy';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace -- Express's request types are augmented through its global namespace
  namespace Express {
    /** What passport keeps on req.user: the signed-in account. */
    interface User {
      id: string;
      email: string;
      displayName: string;
      emailVerified: boolean;
    }
    interface Request {
      /** Set by a studio policy: the caller's membership in req.params.studioId. */
      membership?: Member;
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    /** When the user signed in (ms since epoch), for the absolute session lifetime. */
    signedInAt?: number;
  }
}

export {};
