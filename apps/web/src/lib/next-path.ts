import { paths } from '../config/paths';

/**
 * Where to go after signing in. Only a path on this site is accepted: it must start with
 * a single "/" (not "//" or "/\", which browsers treat as another host), and it must not
 * point back at the sign-in page itself.
 */
export function safeNextPath(raw: string | null | undefined, fallback: string = paths.home.path): string {
  if (!raw || !raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return fallback;
  // Control characters and backslashes have no place in our own paths.
  if (hasUnsafeCharacter(raw)) return fallback;
  let url: URL;
  try {
    const base = 'https://steadyhand.invalid';
    url = new URL(raw, base);
    if (url.origin !== base) return fallback;
  } catch {
    return fallback;
  }
  if (url.pathname === paths.signIn.path) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}

function hasUnsafeCharacter(value: string): boolean {
  for (let i = 0; i < value.length; i += 1) {
    const unit = value.charCodeAt(i);
    if (unit < 0x20 || unit === 0x7f || unit === 0x5c) return true;
  }
  return false;
}

