import "react-router";

declare module "react-router" {
  interface AppLoadContext {
    /** The client's address as server.js saw it (behind a trusted proxy: X-Forwarded-For). */
    clientAddress?: string;
  }
}
