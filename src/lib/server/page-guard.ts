// Guards for pages: redirect to sign-in, or show the 403 page.
import type { AstroGlobal } from 'astro';
import { can, type Permission } from '../domain/roles';
import type { SessionUser } from './session-user';

export type PageGuard = { user: SessionUser; response?: never } | { user?: never; response: Response };

export async function guardPage(Astro: AstroGlobal, permission?: Permission): Promise<PageGuard> {
  const user = Astro.locals.user;
  if (!user) {
    const next = Astro.url.pathname + Astro.url.search;
    return { response: Astro.redirect(`/login?next=${encodeURIComponent(next)}`) };
  }
  if (permission && !can(user.role, permission)) {
    return { response: await Astro.rewrite('/403') };
  }
  return { user };
}
