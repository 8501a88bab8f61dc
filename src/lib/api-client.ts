import { apiErrorSchema } from '@shared/schemas/common.schema';

/** One problem with one input, as the API reports it: `path[0]` names the field. */
export type ApiErrorDetail = { path: (string | number)[]; message: string };

/**
 * An error answered by the API (`{ error: { code, message, details } }`), or a failure to reach it
 * (status 0, code `network`). Carries Retry-After, in seconds, when the server sent one.
 */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly details: ApiErrorDetail[];
  readonly retryAfterSeconds: number | null;

  constructor(opts: {
    status: number;
    code: string;
    message: string;
    details?: ApiErrorDetail[];
    retryAfterSeconds?: number | null;
  }) {
    super(opts.message);
    this.name = 'ApiError';
    this.status = opts.status;
    this.code = opts.code;
    this.details = opts.details ?? [];
    this.retryAfterSeconds = opts.retryAfterSeconds ?? null;
  }
}

export const isApiError = (e: unknown): e is ApiError => e instanceof ApiError;

type Query = Record<string, string | number | boolean | null | undefined>;

function withQuery(path: string, query?: Query) {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query))
    if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

function parseRetryAfter(value: string | null): number | null {
  if (!value) return null;
  const seconds = Number(value);
  if (Number.isFinite(seconds)) return Math.max(0, Math.ceil(seconds));
  const at = Date.parse(value);
  return Number.isNaN(at) ? null : Math.max(0, Math.ceil((at - Date.now()) / 1000));
}

async function request(method: string, path: string, body?: unknown, query?: Query): Promise<unknown> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  const form = body instanceof FormData;
  if (body !== undefined && !form) headers['Content-Type'] = 'application/json';
  if (method !== 'GET') headers['X-Sowright-Request'] = '1';
  let res: Response;
  try {
    res = await fetch(withQuery(path, query), {
      method,
      headers,
      credentials: 'same-origin',
      body: body === undefined ? undefined : form ? body : JSON.stringify(body),
    });
  } catch {
    throw new ApiError({
      status: 0,
      code: 'network',
      message: 'The server could not be reached. Check the connection and try again.',
    });
  }
  const text = await res.text();
  let json: unknown = undefined;
  if (text) {
    try {
      json = JSON.parse(text);
    } catch {
      json = undefined;
    }
  }
  if (!res.ok) {
    const parsed = apiErrorSchema.safeParse(json);
    const retryAfterSeconds = parseRetryAfter(res.headers.get('Retry-After'));
    if (parsed.success) throw new ApiError({ status: res.status, retryAfterSeconds, ...parsed.data.error });
    throw new ApiError({
      status: res.status,
      code: 'http_error',
      message: `The server answered ${res.status} ${res.statusText}`.trim(),
      retryAfterSeconds,
    });
  }
  return json;
}

/** JSON over fetch, same-origin cookies. No toasts, no redirects: callers decide what an error means. */
export const api = {
  get: (path: string, query?: Query) => request('GET', path, undefined, query),
  post: (path: string, body?: unknown) => request('POST', path, body ?? {}),
  put: (path: string, body: unknown) => request('PUT', path, body),
  delete: (path: string, query?: Query) => request('DELETE', path, undefined, query),
  /** A multipart upload (a file and its fields); the browser sets the boundary. */
  upload: (path: string, form: FormData) => request('POST', path, form),
};
