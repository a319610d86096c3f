/** The browser side of our JSON API: one fetch wrapper with one error type. */
export type FieldError = { field: string; reason: string };

export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields: FieldError[] = [],
  ) {
    super(message);
  }
}

export async function api<T>(path: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, headers, ...rest } = init;
  const response = await fetch(path, {
    ...rest,
    headers: { ...(json === undefined ? {} : { 'content-type': 'application/json' }), ...headers },
    body: json === undefined ? rest.body : JSON.stringify(json),
  });
  const text = await response.text();
  const body = text ? safeParse(text) : null;
  if (!response.ok) {
    const problem = (body ?? {}) as { error?: string; fields?: FieldError[] };
    throw new ApiError(response.status, problem.error ?? `Request failed (${response.status})`, problem.fields ?? []);
  }
  return body as T;
}

function safeParse(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return { error: text.slice(0, 200) };
  }
}

/** A message for any thrown error, with the field reasons appended. */
export function describeError(error: unknown): string {
  if (error instanceof ApiError) {
    const details = error.fields.map((f) => `${f.field}: ${f.reason}`).join('; ');
    return details ? `${error.message} (${details})` : error.message;
  }
  return error instanceof Error ? error.message : String(error);
}
