import { getDb } from '../../../lib/server/db';
import { clientIp, handler, json, parseBody } from '../../../lib/server/http';
import { SignupSchema, type AccountRequestJson } from '../../../lib/schemas/accounts';
import { SIGNUP_ANSWER, linkOrigin, requestSignup } from '../../../lib/server/accounts';

/** Contributor sign-up: mails a confirmation link. The answer is the same for a known address. */
export const POST = handler(async (ctx) => {
  const input = await parseBody(SignupSchema, ctx.request);
  await requestSignup(getDb(), input, clientIp(ctx), linkOrigin(ctx.url));
  return json({ ok: true, message: SIGNUP_ANSWER } satisfies AccountRequestJson, 202);
});
