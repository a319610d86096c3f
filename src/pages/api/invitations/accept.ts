import { auth } from '../../../lib/auth';
import { endpoint, json, readJson } from '../../../lib/http';
import { acceptInput, acceptInvitation } from '../../../lib/invitations';

/** Create the invited account and sign it in. */
export const POST = endpoint(async ({ request }) => {
  const input = await readJson(request, acceptInput);
  const { email } = await acceptInvitation(input);
  const signedIn = await auth().api.signInEmail({
    body: { email, password: input.password },
    headers: request.headers,
    asResponse: true,
  });
  const answer = json({ email }, 201);
  for (const cookie of signedIn.headers.getSetCookie()) answer.headers.append('set-cookie', cookie);
  return answer;
});
