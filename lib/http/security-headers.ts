/**
 * The headers every response carries (next.config.ts for all paths; proxy.ts adds the Content
 * Security Policy with a fresh nonce per page, which Next.js puts on its own scripts and styles).
 */

/** Features no page of the app uses; a page that needs one (a camera for labels, say) opens it here. */
const deniedFeatures = [
  "accelerometer",
  "autoplay",
  "bluetooth",
  "camera",
  "display-capture",
  "encrypted-media",
  "fullscreen",
  "geolocation",
  "gyroscope",
  "hid",
  "idle-detection",
  "magnetometer",
  "microphone",
  "midi",
  "payment",
  "picture-in-picture",
  "publickey-credentials-get",
  "screen-wake-lock",
  "serial",
  "usb",
  "xr-spatial-tracking",
];

export const permissionsPolicy = deniedFeatures.map((feature) => `${feature}=()`).join(", ");

/** For every response, pages, API and static files alike (read once, when the app is built). */
export function commonSecurityHeaders(): { key: string; value: string }[] {
  return [
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
    { key: "Permissions-Policy", value: permissionsPolicy },
    // frame-ancestors 'none' in the policy below says the same to browsers that read it.
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    { key: "Cross-Origin-Resource-Policy", value: "same-origin" },
  ];
}

/** Over https only (the app's address decides, when it runs): browsers then refuse plain http for a year. */
export const strictTransportSecurity = "max-age=31536000; includeSubDomains";

/**
 * A page's policy: scripts and style elements only from the app itself or carrying this
 * request's nonce ('strict-dynamic' lets those scripts load the app's other chunks); no inline
 * style attributes, no plugins, no framing, forms post only back to the app.
 */
export function pageContentSecurityPolicy(nonce: string, appUrl: string): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic' 'report-sample'`,
    `style-src 'self' 'nonce-${nonce}' 'report-sample'`,
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    // The offline worker (app/sw.ts, built to /sw.js).
    "worker-src 'self'",
    "manifest-src 'self'",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(appUrl.startsWith("https://") ? ["upgrade-insecure-requests"] : []),
  ].join("; ");
}

/** For what is not a page (JSON, files, static assets): nothing may run or frame it. */
export const resourceContentSecurityPolicy = "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** The service worker's: it fetches and keeps the app's own pages and files, and runs nothing else. */
export const serviceWorkerContentSecurityPolicy = "default-src 'self'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";
