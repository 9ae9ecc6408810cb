export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fieldErrors: Record<string, string[]> = {},
  ) {
    super(message);
  }
}

/** The error body of every API route (lib/api/errors.ts). */
interface ApiErrorBody {
  error?: { message?: string; fieldErrors?: Record<string, string[]> };
}

/** The JSON body of an API response, or an ApiError carrying the route's message (`fallback` when it gives none). */
export async function readApiResponse<T>(res: Response, fallback: string): Promise<T> {
  const body = (await res.json().catch(() => null)) as (ApiErrorBody & T) | null;
  if (!res.ok) throw new ApiError(res.status, body?.error?.message ?? fallback, body?.error?.fieldErrors ?? {});
  return body as T;
}

/** fetch() for the app's own API routes: JSON in, JSON out, API errors as ApiError. */
export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    ...init,
    headers: { accept: "application/json", ...(init?.body ? { "content-type": "application/json" } : {}), ...init?.headers },
  });
  const body = (res.headers.get("content-type")?.includes("application/json") ? await res.json() : null) as ApiErrorBody | null;
  if (!res.ok) {
    const err = body?.error;
    throw new ApiError(res.status, err?.message ?? `Request failed (${res.status})`, err?.fieldErrors ?? {});
  }
  return body as T;
}
