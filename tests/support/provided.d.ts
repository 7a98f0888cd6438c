import "vitest";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    secondBaseUrl: string;
    /** The seeded database the browser tests' app servers use. */
    e2eDatabaseUrl: string;
    /** The app servers' AUTH_SECRET (signs session cookies). */
    e2eAuthSecret: string;
    /** The seeded template each integration test file copies. */
    templateDatabaseUrl: string;
  }
}
