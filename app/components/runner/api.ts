// The runner's calls to the JSON routes. Network failures and 5xx answers are retryable (the
// idempotency key makes a retry safe); 4xx answers are final and carry the server's message.
export class ApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly retryable: boolean,
    readonly code?: string,
  ) {
    super(message);
  }
}

async function send<T>(url: string, init: RequestInit): Promise<T> {
  let res: Response;
  try {
    res = await fetch(url, { credentials: "same-origin", ...init });
  } catch {
    throw new ApiError("No connection. Cluepath keeps trying.", 0, true);
  }
  const body = (await res.json().catch(() => ({}))) as { error?: string; code?: string };
  if (!res.ok)
    throw new ApiError(
      body.error ?? `The server answered ${res.status}.`,
      res.status,
      res.status >= 500 || res.status === 408 || res.status === 429,
      body.code,
    );
  return body as T;
}

export function getJson<T>(url: string): Promise<T> {
  return send<T>(url, { headers: { accept: "application/json" } });
}

export function postJson<T>(url: string, body: unknown): Promise<T> {
  return send<T>(url, {
    method: "POST",
    headers: { "content-type": "application/json", accept: "application/json" },
    body: JSON.stringify(body),
  });
}

export function postForm<T>(url: string, form: FormData): Promise<T> {
  return send<T>(url, { method: "POST", body: form });
}

export const retryable = (count: number, error: unknown) => error instanceof ApiError && error.retryable && count < 8;
export const backoff = (attempt: number) => Math.min(1000 * 2 ** attempt, 15_000);
