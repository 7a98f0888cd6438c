// The editor's calls to the trees API (used through TanStack Query).
import type { Finding, Tree } from "~/engine/types";
import type { Layout } from "./draft";

export type Validation = { revision: number; findings: Finding[]; errors: number; warnings: number; sameAs: number | null };
export type SaveOk = { revision: number; updatedAt: string };
export type Conflict = { revision: number; updatedByName: string | null; updatedAt: string };

export class SaveError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly conflict?: Conflict,
  ) {
    super(message);
  }
}

async function json<T>(res: Response): Promise<T> {
  const body = (await res.json().catch(() => ({}))) as T & { error?: string };
  if (!res.ok)
    throw new SaveError(
      body.error ?? `The server answered ${res.status}.`,
      res.status,
      res.status === 409 ? (body as unknown as { conflict?: Conflict }).conflict : undefined,
    );
  return body;
}

export async function saveDraft(
  treeId: string,
  body: { versionId: string; revision: number; tree: Tree; layout: Layout },
): Promise<SaveOk> {
  const res = await fetch(`/api/trees/${treeId}/draft`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify(body),
  });
  return json<SaveOk>(res);
}

export async function fetchValidation(treeId: string): Promise<Validation> {
  return json<Validation>(await fetch(`/api/trees/${treeId}/validation`));
}

export async function fetchDraft(
  treeId: string,
): Promise<{ versionId: string; revision: number; tree: Tree; layout: Layout; updatedByName: string | null }> {
  return json(await fetch(`/api/trees/${treeId}/versions/draft`));
}

export async function uploadImage(treeId: string, file: File): Promise<{ url: string; filename: string }> {
  const form = new FormData();
  form.append("photo", file);
  return json(await fetch(`/api/trees/${treeId}/images`, { method: "POST", body: form }));
}
