import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody } from '../../../lib/server/http';
import { lucia, setSessionCookie } from '../../../lib/server/auth';
import { SetPasswordSchema, type SignedInJson } from '../../../lib/schemas/accounts';
import { setPasswordFromLink } from '../../../lib/server/accounts';

/** Sets the password from a reset or invitation link (once), ends other sessions and signs in. */
export const POST = handler(async ({ request, cookies, url }) => {
  const { token, password } = await parseBody(SetPasswordSchema, request);
  const { user } = await setPasswordFromLink(getDb(), token, password);
  const session = await lucia.createSession(user.id, {});
  setSessionCookie(cookies, url, session.id);
  return json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } } satisfies SignedInJson);
});
