import { checkHealth } from "@/src/server/health";
import { json } from "@/src/server/http/respond";

export const runtime = "nodejs";
export const dynamic = "force-dynamic";

export async function GET(): Promise<Response> {
  const health = await checkHealth();
  return json(health, { status: health.status === "ok" ? 200 : 503 });
}
