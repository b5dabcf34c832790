/**
 * The one small typed API client. Network calls live only in hooks/.
 * Writes carry `X-Keelson-Client`, which a cross-site form cannot set; the
 * server refuses cookie-authenticated writes without it (and checks Origin).
 */
export type FieldIssue = { path: string; message: string };

export class ApiError extends Error {
  constructor(
    public status: number,
    message: string,
    public issues: FieldIssue[] = [],
    public code?: string,
  ) {
    super(message);
  }
}

const BASE = process.env.EXPO_PUBLIC_API_BASE ?? '';

export async function api<T>(path: string, init: { method?: string; body?: unknown; form?: FormData } = {}): Promise<T> {
  const method = init.method ?? (init.body !== undefined || init.form ? 'POST' : 'GET');
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (method !== 'GET') headers['X-Keelson-Client'] = '1';
  if (init.body !== undefined) headers['Content-Type'] = 'application/json';
  let res: Response;
  try {
    res = await fetch(`${BASE}/api${path}`, {
      method,
      headers,
      credentials: 'same-origin',
      body: init.form ?? (init.body !== undefined ? JSON.stringify(init.body) : undefined),
    });
  } catch {
    throw new ApiError(0, 'Keelson cannot reach its server. Check your connection and try again.');
  }
  const text = await res.text();
  const data = text ? safeJson(text) : null;
  if (!res.ok) {
    const d = (data ?? {}) as { message?: string; issues?: FieldIssue[]; error?: string };
    throw new ApiError(res.status, d.message ?? `Request failed (${res.status})`, d.issues ?? [], d.error);
  }
  return data as T;
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return { message: text };
  }
}

/** The message for a field, if the server named it in a 400 answer. */
export function fieldError(err: unknown, path: string): string | undefined {
  if (!(err instanceof ApiError)) return undefined;
  return err.issues.find((i) => i.path === path || i.path.startsWith(`${path}.`))?.message;
}
