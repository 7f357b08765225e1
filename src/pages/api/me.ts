import { handler, json, requireUser } from '../../lib/server/http';

export const GET = handler(({ locals }) => {
  const user = requireUser(locals);
  return json({ user });
});
