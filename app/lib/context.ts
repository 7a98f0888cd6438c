import type { Role } from "./roles";

/** The caller, always taken from the session. Every model function takes it first. */
export type Ctx = {
  shopId: string;
  userId: string;
  role: Role;
  /** Where the request came from (the server entry's client address), for the audit trail. */
  address?: string;
};
