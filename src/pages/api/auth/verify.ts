import { getDb } from '../../../lib/server/db';
import { handler, json, parseBody } from '../../../lib/server/http';
import { lucia, setSessionCookie } from '../../../lib/server/auth';
import { VerifySchema, type SignedInJson } from '../../../lib/schemas/accounts';
import { confirmSignup } from '../../../lib/server/accounts';

/** Follows a sign-up link once: makes the contributor account and signs its owner in. */
export const POST = handler(async ({ request, cookies, url }) => {
  const { token } = await parseBody(VerifySchema, request);
  const user = await confirmSignup(getDb(), token);
  const session = await lucia.createSession(user.id, {});
  setSessionCookie(cookies, url, session.id);
  return json({ user: { id: user.id, email: user.email, name: user.name, role: user.role } } satisfies SignedInJson, 201);
});
