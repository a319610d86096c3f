import type { APIRoute } from 'astro';
import { auth } from '../lib/auth';

export const POST: APIRoute = async ({ request }) => {
  const answer = await auth().api.signOut({ headers: request.headers, asResponse: true });
  // The browser forgets what this person left in storage on the device: intents kept unsent over a reload (live-client.ts).
  const headers = new Headers({ location: '/sign-in', 'clear-site-data': '"storage"' });
  for (const cookie of answer.headers.getSetCookie()) headers.append('set-cookie', cookie);
  return new Response(null, { status: 303, headers });
};
