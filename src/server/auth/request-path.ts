/** Request header in which proxy.ts passes the requested path (+ query) on to pages, for `?next=`. */
export const REQUEST_PATH_HEADER = "x-request-path";
