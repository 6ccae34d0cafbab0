"use client";
/** Errors inside the workspace keep the top bar; same plain message as the root error page. */
export { default } from "../error";
