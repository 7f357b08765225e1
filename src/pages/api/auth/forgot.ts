import { getDb } from '../../../lib/server/db';
import { clientIp, handler, json, parseBody } from '../../../lib/server/http';
import { ForgotSchema, type AccountRequestJson } from '../../../lib/schemas/accounts';
import { RESET_ANSWER, linkOrigin, requestPasswordReset } from '../../../lib/server/accounts';

/** Asks for a password reset link. The answer is the same whether or not the address has an account. */
export const POST = handler(async (ctx) => {
  const { email } = await parseBody(ForgotSchema, ctx.request);
  await requestPasswordReset(getDb(), email, clientIp(ctx), linkOrigin(ctx.url));
  return json({ ok: true, message: RESET_ANSWER } satisfies AccountRequestJson, 202);
});
