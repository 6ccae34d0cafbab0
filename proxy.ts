/**
 * Per-request Content-Security-Policy with a fresh nonce. Next reads the policy from the
 * request header and puts the nonce on its own inline scripts, so no 'unsafe-inline' is
 * needed for scripts. Inline style attributes (React, recharts) need style-src 'unsafe-inline'.
 *
 * API routes are left out of the matcher: they answer JSON or files (no CSP needed), and a
 * proxied request has its body buffered and cut at 10 MB, which would break 200 MB log uploads.
 * The requested path is passed on so that requireActor() can send a signed-out user back to it.
 */
import { NextResponse, type NextRequest } from "next/server";
import { REQUEST_PATH_HEADER } from "@/src/server/auth/request-path";

function contentSecurityPolicy(nonce: string): string {
  const dev = process.env.NODE_ENV === "development";
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

export function proxy(request: NextRequest) {
  const nonce = Buffer.from(crypto.randomUUID()).toString("base64");
  const policy = contentSecurityPolicy(nonce);
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("x-nonce", nonce);
  requestHeaders.set("Content-Security-Policy", policy);
  requestHeaders.set(REQUEST_PATH_HEADER, request.nextUrl.pathname + request.nextUrl.search);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  matcher: [
    {
      source: "/((?!api/|_next/static|_next/image|icon.svg|favicon.ico).*)",
      missing: [
        { type: "header", key: "next-router-prefetch" },
        { type: "header", key: "purpose", value: "prefetch" },
      ],
    },
  ],
};
