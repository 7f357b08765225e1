// Every page a role sees: its navigation, and the pages reached from it (a customer, an aim
// sheet). Browser tests that visit "every page" take their list from here.
import type { Page } from 'playwright-core';
import { APP_URL } from './browser';
import { navigationFor } from '../../src/lib/domain/navigation';
import { can, type Permission, type Role } from '../../src/lib/domain/roles';

export interface PageToVisit {
  /** The route, as the test names it. */
  label: string;
  /** The path to open; a function finds an id in the demo data first. */
  path: string | ((page: Page) => Promise<string>);
}

const firstPlan = async (page: Page, state: string) => {
  const r = await (await page.request.get(`${APP_URL}/api/plans?state=${state}&limit=1`)).json();
  return r.items[0] as { id: string; customer_id: string };
};

const REACHED_PAGES: ReadonlyArray<PageToVisit & { permission: Permission | null }> = [
  { label: '/', path: '/', permission: null },
  { label: '/admin', path: '/admin', permission: 'users:manage' },
  { label: '/sightings/new', path: '/sightings/new', permission: 'sightings:submit' },
  { label: '/customers/:id', path: async (page) => `/customers/${(await firstPlan(page, 'verified')).customer_id}`, permission: 'plans:view' },
  { label: '/plans/:id/sheet', path: async (page) => `/plans/${(await firstPlan(page, 'planned')).id}/sheet`, permission: 'plans:view' },
];

export function pagesFor(role: Role): PageToVisit[] {
  const nav: PageToVisit[] = navigationFor(role).map((i) => ({ label: i.href, path: i.href }));
  const reached = REACHED_PAGES.filter((p) => p.permission === null || can(role, p.permission));
  const seen = new Set<string>();
  return [...reached, ...nav].filter((p) => !seen.has(p.label) && seen.add(p.label));
}

export async function openPage(page: Page, p: PageToVisit) {
  const path = typeof p.path === 'string' ? p.path : await p.path(page);
  return page.goto(`${APP_URL}${path}`);
}

/** Waits for the islands to fetch and draw: no request for half a second, or 10 s at most. */
export async function settle(page: Page) {
  await page.waitForLoadState('networkidle', { timeout: 10_000 }).catch(() => undefined);
  await page.waitForTimeout(300);
}
