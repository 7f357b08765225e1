import { handler, json, requirePermission } from '../../../lib/server/http';
import { sendMail } from '../../../lib/server/mail';
import { AppError } from '../../../lib/server/errors';

// Sends a test message to the signed-in admin, to check the SMTP settings.
export const POST = handler(async ({ locals, request, redirect }) => {
  const user = requirePermission(locals, 'mail:view');
  try {
    await sendMail({
      to: user.email,
      subject: 'Bearline test message',
      text: `This is a test message from Bearline, sent by ${user.name}. Mail delivery works.`,
    });
  } catch (err) {
    console.error('[bearline] test mail failed', err instanceof Error ? err.message : err);
    throw new AppError('SERVICE_UNAVAILABLE', 'The mail server did not accept the message. Check SMTP_URL.');
  }
  const wantsJson = (request.headers.get('accept') ?? '').includes('application/json');
  return wantsJson ? json({ ok: true, to: user.email }) : redirect('/admin/mailbox?sent=1', 303);
});
