/**
 * What every JSON endpoint shares: one error shape, body parsing through zod,
 * and the sign-in and permission guards. Errors never carry a stack trace.
 */
import type { APIContext, APIRoute } from 'astro';
import { z, type ZodType } from 'zod';
import { decide, type Action, type Actor, type ContextOf } from './access';
import type { SessionUser } from './auth';

export type FieldError = { field: string; reason: string };

export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly fields: FieldError[] = [],
  ) {
    super(message);
  }
}

export function json(data: unknown, status = 200, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(data), {
    status,
    headers: { 'content-type': 'application/json; charset=utf-8', 'cache-control': 'no-store', ...headers },
  });
}

export function problem(status: number, error: string, fields: FieldError[] = []): Response {
  return json(fields.length ? { error, fields } : { error }, status);
}

export function fieldErrors(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({ field: issue.path.join('.') || '(body)', reason: issue.message }));
}

export function validate<T>(schema: ZodType<T>, value: unknown, what = 'Invalid input'): T {
  const parsed = schema.safeParse(value);
  if (!parsed.success) throw new HttpError(400, what, fieldErrors(parsed.error));
  return parsed.data;
}

export async function readJson<T>(request: Request, schema: ZodType<T>): Promise<T> {
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    throw new HttpError(400, 'The request body is not valid JSON', [{ field: '(body)', reason: 'not JSON' }]);
  }
  return validate(schema, body);
}

export function requireActor(locals: App.Locals): SessionUser {
  if (!locals.user) throw new HttpError(401, 'Sign in first');
  return locals.user;
}

export function authorize<A extends Action>(actor: Actor | null, action: A, ctx: ContextOf<A>): void {
  const decision = decide(actor, action, ctx);
  if (!decision.ok) throw new HttpError(decision.status, decision.reason);
}

/** Wrap an endpoint so thrown HttpErrors become JSON answers and nothing else leaks. */
export function endpoint(handler: (ctx: APIContext) => Promise<Response> | Response): APIRoute {
  return async (ctx) => {
    try {
      return await handler(ctx);
    } catch (error) {
      if (error instanceof HttpError) return problem(error.status, error.message, error.fields);
      console.error(`[api] ${ctx.request.method} ${ctx.url.pathname}`, error);
      return problem(500, 'Something went wrong on the server. The fault was logged; please try again.');
    }
  };
}
