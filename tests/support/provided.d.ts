import "vitest";

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    secondBaseUrl: string;
  }
}
