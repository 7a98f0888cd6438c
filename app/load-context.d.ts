import "react-router";

declare module "react-router" {
  interface AppLoadContext {
    /** The client's address as the server entry saw it (behind a trusted proxy: X-Forwarded-For). */
    clientAddress?: string;
    /** This request's id, also sent back as X-Request-Id and written on its log lines. */
    requestId?: string;
    /** True under `npm run dev` (Vite in middleware mode). */
    dev?: boolean;
  }
}
