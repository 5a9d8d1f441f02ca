import 'express-session';

declare global {
  namespace Express {
    interface User {
      id: string;
      email: string;
      name: string;
    }
    interface Request {
      /** Set by the studio router once membership is checked. */
      member?: {
        studioId: string;
        userId: string | null;
        tokenId: string | null;
        roles: string[];
        venueIds: string[];
      };
    }
  }
}

declare module 'express-session' {
  interface SessionData {
    csrfToken?: string;
  }
}

export {};
