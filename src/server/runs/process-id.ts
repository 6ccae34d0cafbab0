import "server-only";
/**
 * Boot id of this server process. A run left "queued" or "running" by another boot id was cut off
 * (the server stopped or crashed mid-run) and is marked failed the next time runs are read.
 */
import { randomUUID } from "node:crypto";

const g = globalThis as unknown as { __fieldtideProcessId?: string };
export const PROCESS_ID: string = (g.__fieldtideProcessId ??= randomUUID());
