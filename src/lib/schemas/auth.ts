import { z } from 'zod';

export const LoginSchema = z.object({
  email: z.string().trim().min(1, 'Enter your e-mail').email('Enter a valid e-mail address').max(254),
  password: z.string().min(1, 'Enter your password').max(200),
  next: z.string().optional(),
});
export type LoginInput = z.infer<typeof LoginSchema>;

/** Only same-site paths are followed after sign-in. */
export function safeNextPath(next: string | undefined | null): string {
  if (!next || !next.startsWith('/') || next.startsWith('//') || next.startsWith('/\\')) return '/';
  return next;
}
