/** Small fetch helpers for the import screens: JSON in, JSON out, errors as messages. */
export class ApiError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly body: unknown,
  ) {
    super(message);
  }
}

export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    ...init,
    headers: {
      accept: "application/json",
      ...(init?.body ? { "content-type": "application/json" } : {}),
    },
  });
  const body = (await res.json().catch(() => null)) as { error?: string } | null;
  if (!res.ok) {
    throw new ApiError(
      body?.error ??
        (res.status === 401
          ? "Your session has ended; sign in again."
          : `Request failed (HTTP ${res.status}).`),
      res.status,
      body,
    );
  }
  return body as T;
}
