// The one place that talks HTTP to the Voltfall API (same origin, session cookie).

export interface FieldError {
  path: string;
  message: string;
}

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldError[] = [],
    /** The whole answer, for errors that carry more than the error (a stale write carries `current`). */
    readonly body: unknown = null,
  ) {
    super(message);
  }
}

async function parse<T>(res: Response): Promise<T> {
  const text = await res.text();
  const body = text ? (JSON.parse(text) as unknown) : null;
  if (!res.ok) {
    const error = (body as { error?: { code: string; message: string; fields?: FieldError[] } } | null)?.error;
    throw new ApiError(res.status, error?.code ?? 'http_error', error?.message ?? `The server answered ${res.status}.`, error?.fields, body);
  }
  return body as T;
}

export async function apiGet<T>(path: string): Promise<T> {
  return parse<T>(await fetch(`/api${path}`, { credentials: 'same-origin' }));
}

export async function apiSend<T>(method: 'POST' | 'PATCH' | 'DELETE', path: string, body?: unknown): Promise<T> {
  const res = await fetch(`/api${path}`, {
    method,
    credentials: 'same-origin',
    headers: body === undefined ? {} : { 'Content-Type': 'application/json' },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return parse<T>(res);
}

/** Multipart upload with progress (fetch cannot report upload progress, XMLHttpRequest can). */
export function apiUpload<T>(path: string, form: FormData, onProgress?: (fraction: number) => void): Promise<T> {
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api${path}`);
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError(0, 'network', 'The upload did not reach the server.'));
    xhr.onload = () => {
      const res = new Response(xhr.responseText, { status: xhr.status });
      parse<T>(res).then(resolve, reject);
    };
    xhr.send(form);
  });
}
