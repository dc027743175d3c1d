/**
 * Security headers on every response the Worker writes (the form pages get the
 * same set from static/_headers, which Workers Static Assets applies). A
 * response that brings its own Content-Security-Policy (the report page)
 * keeps it; every other one forbids all loads and all framing.
 */
import type { MiddlewareHandler } from "hono";

/** Nothing may load, frame or submit from a JSON, CSV or problem answer. */
export const DATA_POLICY = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";
/**
 * A PDF keeps only the framing and form rules: a default-src 'none' (hence
 * object-src 'none') on a PDF can stop a browser's built-in viewer from showing it.
 */
export const PDF_POLICY = "frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

const COMMON: Record<string, string> = {
  "X-Content-Type-Options": "nosniff",
  "Referrer-Policy": "no-referrer",
  "X-Frame-Options": "DENY",
  "Strict-Transport-Security": "max-age=31536000; includeSubDomains",
  "Permissions-Policy": "camera=(), microphone=(), geolocation=(), payment=(), usb=(), interest-cohort=()",
  "Cross-Origin-Opener-Policy": "same-origin",
};

export const securityHeaders: MiddlewareHandler = async (c, next) => {
  await next();
  const policy = (c.res.headers.get("content-type") ?? "").startsWith("application/pdf") ? PDF_POLICY : DATA_POLICY;
  const wanted: Record<string, string> = { ...COMMON, "Content-Security-Policy": policy };
  const missing = Object.entries(wanted).filter(([name]) => !c.res.headers.has(name));
  if (missing.length === 0) return;
  try {
    for (const [name, value] of missing) c.res.headers.set(name, value);
  } catch {
    // A response passed through from another fetch (static assets in the test pool) has immutable headers: copy it once.
    const response = new Response(c.res.body, c.res);
    for (const [name, value] of missing) response.headers.set(name, value);
    c.res = response;
  }
};
