// What a technician's phone keeps for working without signal (GET /api/field-kit), as the server
// sends it and the phone stores it. Types only: shared by the model and the phone's storage.
import type { Tree } from "../engine/types";
import type { MdBlock } from "./md";
import type { MeterView, RunView } from "./run-log";

export type KitProcedure = { treeId: string; versionId: string; title: string; number: number | null; symptom: string };

export type KitCall = {
  id: string;
  number: number;
  symptom: string;
  priority: string;
  status: string;
  customerName: string;
  siteName: string;
  siteAddress: string;
  make: string;
  model: string;
  unit: NonNullable<RunView["unit"]>;
  openRun: { id: string; status: string } | null;
  /** Published procedures for this kind of equipment, best match first. */
  procedures: KitProcedure[];
};

export type KitVersion = {
  id: string;
  treeId: string;
  number: number | null;
  title: string;
  tree: Tree;
  bodies: Record<string, MdBlock[]>;
  description: MdBlock[];
};

export type FieldKit = {
  user: { id: string; name: string };
  timeZone: string;
  meters: MeterView[];
  calls: KitCall[];
  /** The runs in progress on those calls that the caller holds, whole. */
  runs: RunView[];
  /** The procedures' published versions, except those the phone already has (`have`). */
  versions: Record<string, KitVersion>;
};

/** The header a service worker sends for a page's empty shell (no user, no data) to keep offline. */
export const SHELL_HEADER = "x-cluepath-shell";

/** Whether a page request asks for the empty shell the service worker keeps. */
export function isShellRequest(request: Request): boolean {
  return request.headers.get(SHELL_HEADER) === "1";
}
