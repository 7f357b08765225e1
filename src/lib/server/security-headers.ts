// Response headers every answer carries: content security policy, no sniffing, no framing,
// no referrer to other sites, and no caching of private answers.
import { createHash } from 'node:crypto';

/**
 * The policy for pages. Inline scripts run only when their hash is listed (Astro's island
 * bootstrap is inline); MapLibre needs blob: workers and images; styles may be inline
 * (style attributes rendered by React and Astro).
 */
export function contentSecurityPolicy(scriptHashes: readonly string[] = []): string {
  const scripts = ["'self'", ...scriptHashes.map((h) => `'${h}'`)].join(' ');
  return [
    "default-src 'self'",
    `script-src ${scripts}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self' data:",
    "connect-src 'self'",
    "worker-src 'self' blob:",
    "child-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}

/** The policy for JSON and other non-HTML answers: nothing may run or frame them. */
export const API_CSP = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** sha256 hashes (CSP source form) of the inline executable scripts of an HTML page. */
export function inlineScriptHashes(html: string): string[] {
  const hashes = new Set<string>();
  const re = /<script\b([^>]*)>([\s\S]*?)<\/script>/gi;
  for (let m = re.exec(html); m; m = re.exec(html)) {
    const attrs = m[1] ?? '';
    const body = m[2] ?? '';
    if (/\bsrc\s*=/i.test(attrs) || body.length === 0) continue;
    const type = /\btype\s*=\s*["']?([^"'\s>]+)/i.exec(attrs)?.[1]?.toLowerCase();
    if (type && type !== 'module' && type !== 'text/javascript' && type !== 'application/javascript') continue; // data blocks do not run
    hashes.add(`sha256-${createHash('sha256').update(body, 'utf8').digest('base64')}`);
  }
  return [...hashes];
}

export const COMMON_HEADERS: Record<string, string> = {
  'X-Content-Type-Options': 'nosniff',
  'X-Frame-Options': 'DENY',
  'Referrer-Policy': 'same-origin',
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Permissions-Policy': 'camera=(), microphone=(), payment=(), usb=(), geolocation=(self)',
};

/** Copies a response so its headers can be changed (some responses have immutable headers). */
export function mutable(response: Response, body: BodyInit | null = response.body): Response {
  return new Response(body, { status: response.status, statusText: response.statusText, headers: new Headers(response.headers) });
}
