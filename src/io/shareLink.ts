import type { Plan } from '../core/plan';
import { validatePlan, type PlanCheck } from '../core/validatePlan';
import { canonicalPlan } from './planFile';

/** The URL-fragment key that carries a plan: "#plan=<base64url of UTF-8 JSON>". */
export const LINK_KEY = 'plan';

/**
 * The URL fragment that carries a plan, "#plan=…": the plan's compact JSON
 * (stable key order) as UTF-8, in base64url without padding (RFC 4648 §5),
 * so any label text, including non-ASCII, survives the address bar.
 * @example location.hash = encodePlanForLink(plan) // "#plan=eyJmb3JtYXQiOi…"
 */
export function encodePlanForLink(plan: Plan): string {
  const bytes = new TextEncoder().encode(JSON.stringify(canonicalPlan(plan)));
  return `#${LINK_KEY}=${toBase64Url(bytes)}`;
}

/**
 * Read a plan back from a shared link: a whole address, its "#plan=…"
 * fragment, or "plan=…". Truncated or garbled links get a plain message;
 * a readable plan is checked like a plan file (see validatePlan). Never throws.
 */
export function decodePlanFromLink(hashOrUrl: string): PlanCheck {
  const problem = (message: string): PlanCheck => ({ ok: false, problems: [{ field: '', message }] });
  const s = hashOrUrl.trim();
  const hashAt = s.indexOf('#');
  const fragment = hashAt >= 0 ? s.slice(hashAt + 1) : s;
  const params = fragment.split('&');
  const entry = params.find((p) => p.startsWith(`${LINK_KEY}=`));
  if (entry === undefined) {
    const near = params.find((p) => looksLikePlanPart(p));
    if (near !== undefined) {
      return problem(
        `This link is garbled: a plan link has "#${LINK_KEY}=" followed by the plan, but this one reads ${shortQuote(`#${near}`)}. Copy the whole link again.`,
      );
    }
    return problem(`This link holds no plan: its address has no "#${LINK_KEY}=" part.`);
  }
  let payload = entry.slice(LINK_KEY.length + 1);
  try {
    payload = decodeURIComponent(payload); // some mail programs percent-encode links
  } catch {
    return problem('This link is garbled: its plan part contains characters a plan link never has. Copy the whole link again.');
  }
  if (payload === '') return problem('This link holds no plan: the part after "#plan=" is empty. Copy the whole link again.');
  const badChar = /[^A-Za-z0-9\-_=]/.exec(payload);
  if (badChar) {
    return problem(
      `This link is garbled: its plan part contains ${JSON.stringify(badChar[0])} (character ${badChar.index + 1}), which a plan link never has. Copy the whole link again.`,
    );
  }
  const bytes = fromBase64Url(payload.replace(/=+$/, ''));
  const truncated = 'This link is incomplete: it seems to have been cut short when it was copied. Copy the whole link again.';
  if (bytes === null) return problem(truncated);
  let text: string;
  try {
    text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    return problem(truncated);
  }
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    return problem(truncated);
  }
  return validatePlan(data);
}

/**
 * Whether one fragment parameter was meant to carry a plan but is malformed:
 * it starts with "plan" (any case, after stray spaces or percent-escapes),
 * e.g. "plan", "plan:eyJ…", "PLAN=…", "plan%3DeyJ…".
 * @example looksLikePlanPart("plan") // true; looksLikePlanPart("results") // false
 */
export function looksLikePlanPart(part: string): boolean {
  let text = part;
  try {
    text = decodeURIComponent(part);
  } catch {
    // Keep the raw text: a broken escape is itself a sign of a garbled link.
  }
  return /^\s*plan/i.test(text);
}

/** At most 40 characters of untrusted text, quoted, control characters escaped. */
function shortQuote(text: string): string {
  const cut = text.length > 40 ? `${text.slice(0, 40)}…` : text;
  return JSON.stringify(cut);
}

function toBase64Url(bytes: Uint8Array): string {
  let binary = '';
  for (let i = 0; i < bytes.length; i += 0x8000) {
    binary += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  }
  return btoa(binary).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

/** Bytes from unpadded base64url, or null when the length cannot be base64 (cut short). */
function fromBase64Url(s: string): Uint8Array | null {
  if (s.length % 4 === 1) return null;
  const b64 = s.replace(/-/g, '+').replace(/_/g, '/') + '='.repeat((4 - (s.length % 4)) % 4);
  let binary: string;
  try {
    binary = atob(b64);
  } catch {
    return null;
  }
  const out = new Uint8Array(binary.length);
  for (let i = 0; i < binary.length; i++) out[i] = binary.charCodeAt(i);
  return out;
}
