// Which address a request comes from: the socket's peer, unless that peer is a proxy listed in
// TRUSTED_PROXIES, in which case X-Forwarded-For is read from the right, skipping trusted hops.
// Plain JavaScript: loaded by serve.mjs with `node` alone.
import { BlockList, isIP } from 'node:net';

/**
 * "10.0.0.0/8, 127.0.0.1, ::1" → a list to check addresses against. Throws on a bad entry.
 * @param {string} text
 * @returns {BlockList}
 */
export function parseTrustedProxies(text) {
  const list = new BlockList();
  for (const raw of text
    .split(',')
    .map((s) => s.trim())
    .filter(Boolean)) {
    const [address, bits] = raw.split('/');
    const family = isIP(address);
    if (family === 0) throw new Error(`TRUSTED_PROXIES: "${raw}" is not an IP address or CIDR range`);
    const type = family === 6 ? 'ipv6' : 'ipv4';
    if (bits === undefined) list.addAddress(address, type);
    else {
      const prefix = Number(bits);
      if (!/^\d+$/.test(bits) || prefix > (family === 6 ? 128 : 32)) throw new Error(`TRUSTED_PROXIES: "${raw}" has a bad prefix length`);
      list.addSubnet(address, prefix, type);
    }
  }
  return list;
}

/**
 * "::ffff:10.1.2.3" → "10.1.2.3"; blank or junk → null.
 * @param {string | undefined} text
 * @returns {string | null}
 */
export function normaliseAddress(text) {
  const trimmed = (text ?? '').trim().replace(/^\[(.*)\]$/, '$1');
  const plain = trimmed.toLowerCase().startsWith('::ffff:') && isIP(trimmed.slice(7)) === 4 ? trimmed.slice(7) : trimmed;
  return isIP(plain) ? plain : null;
}

/** @param {BlockList} list @param {string} address */
function isTrusted(list, address) {
  return list.check(address, isIP(address) === 6 ? 'ipv6' : 'ipv4');
}

/**
 * The client address of a request. A forwarded header from anyone but a trusted proxy is
 * ignored (anyone can write one); behind trusted proxies, the right-most untrusted hop wins.
 * @param {string | undefined} peer
 * @param {string | string[] | undefined} forwardedFor
 * @param {BlockList} trusted
 * @returns {string}
 */
export function resolveClientAddress(peer, forwardedFor, trusted) {
  const socket = normaliseAddress(peer) ?? 'unknown';
  if (socket === 'unknown' || !isTrusted(trusted, socket)) return socket;
  const hops = (Array.isArray(forwardedFor) ? forwardedFor.join(',') : (forwardedFor ?? '')).split(',');
  let client = socket;
  for (let i = hops.length - 1; i >= 0; i--) {
    const hop = normaliseAddress(hops[i]);
    if (!hop) break; // junk in the chain: stop at what is known
    client = hop;
    if (!isTrusted(trusted, hop)) break;
  }
  return client;
}

// Methods a web Request cannot even carry (Fetch standard, "forbidden methods"): refused before
// the framework with a clean 405 rather than a 500 from inside it.
export const REFUSED_METHODS = new Set(['TRACE', 'TRACK', 'CONNECT']);

/**
 * Answers a refused method: the error shape under /api/, plain text elsewhere.
 * @param {import('node:http').IncomingMessage} req
 * @param {import('node:http').ServerResponse} res
 */
export function refuseMethod(req, res) {
  const api = (req.url ?? '').startsWith('/api/');
  const headers = { Allow: 'GET, HEAD', 'Cache-Control': 'no-store', 'X-Content-Type-Options': 'nosniff' };
  if (api) {
    res.writeHead(405, { ...headers, 'Content-Type': 'application/json; charset=utf-8' });
    res.end(JSON.stringify({ error: { code: 'METHOD_NOT_ALLOWED', message: `${req.method} is not answered` } }));
  } else {
    res.writeHead(405, { ...headers, 'Content-Type': 'text/plain; charset=utf-8' });
    res.end(`${req.method} is not answered.\n`);
  }
  req.resume();
}
