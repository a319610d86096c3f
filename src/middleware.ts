import { defineMiddleware } from 'astro:middleware';
import { userFromHeaders } from './lib/auth';

/** Paths anyone may open without signing in. */
const PUBLIC = [/^\/sign-in$/, /^\/forgot-password$/, /^\/reset-password$/, /^\/invitation$/, /^\/api\/auth\//, /^\/api\/health$/, /^\/api\/invitations\/accept$/];

export const onRequest = defineMiddleware(async ({ request, locals, url, redirect }, next) => {
  locals.user = await userFromHeaders(request.headers);
  if (locals.user || PUBLIC.some((pattern) => pattern.test(url.pathname))) return next();
  if (url.pathname.startsWith('/api/')) {
    return new Response(JSON.stringify({ error: 'Sign in first' }), {
      status: 401,
      headers: { 'content-type': 'application/json; charset=utf-8' },
    });
  }
  return redirect(`/sign-in?next=${encodeURIComponent(url.pathname + url.search)}`);
});
