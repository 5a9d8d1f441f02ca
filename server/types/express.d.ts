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
        /**
         * The studio's data version (server/db/schema.ts studioDataVersions), read with the
         * membership at the start of the request; undefined on the API token path.
         */
        dataVersion?: number;
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
