// The phone's storage for one user (IndexedDB through idb): the runs kept here as the server last
// sent them, the outbox of what was done here and not yet accepted by the server (in order, with
// idempotency keys and the phone's clock), and the field kit (today's calls and the procedures to
// start a run offline). Version the schema here; an update of the app opens the old data.
import { openDB, type DBSchema, type IDBPDatabase } from "idb";
import type { LogEntry } from "~/engine/traversal";
import type { KitCall, KitVersion } from "~/lib/field-kit";
import type { MeterView, RunView } from "~/lib/run-log";
import { phoneDbName } from "./who";

export type StoredRun = {
  id: string;
  /** The run as the server last sent it (or as the phone made it, while `local`). */
  view: RunView;
  /** Started on this phone and not yet created on the server. */
  local: boolean;
  /** When the technician last opened it here (runs only kept from the kit have none). */
  openedAt: string | null;
  savedAt: string;
};

export type Refusal = { status: number; message: string; code?: string; at: string };

type ItemBase = {
  /** Order on this phone (sent in this order). */
  n: number;
  runId: string;
  /** The idempotency key the server knows it by (the run's id for a start). */
  key: string;
  /** The phone's clock when it was done. */
  at: string;
  /** queued: waiting to be sent; refused: the server said no; held: behind a refused one of its run. */
  state: "queued" | "refused" | "held";
  refusal?: Refusal;
};

export type OutboxItem = ItemBase &
  (
    | { kind: "start"; treeId: string; versionId: string; callId: string | null }
    | { kind: "step"; entry: LogEntry; meterId: string | null }
    | { kind: "note"; node: string; text: string }
    | { kind: "photo"; node: string; photo: Blob; fileName: string }
  );

export type KitMeta = { user: { id: string; name: string }; timeZone: string; meters: MeterView[]; savedAt: string };

interface PhoneSchema extends DBSchema {
  runs: { key: string; value: StoredRun };
  outbox: { key: number; value: OutboxItem };
  calls: { key: string; value: KitCall };
  versions: { key: string; value: KitVersion };
  meta: { key: string; value: KitMeta };
}

export type PhoneDb = IDBPDatabase<PhoneSchema>;

export function openPhoneDb(userId: string): Promise<PhoneDb> {
  return openDB<PhoneSchema>(phoneDbName(userId), 1, {
    upgrade(db) {
      db.createObjectStore("runs", { keyPath: "id" });
      db.createObjectStore("outbox", { keyPath: "n" });
      db.createObjectStore("calls", { keyPath: "id" });
      db.createObjectStore("versions", { keyPath: "id" });
      db.createObjectStore("meta");
    },
  });
}
