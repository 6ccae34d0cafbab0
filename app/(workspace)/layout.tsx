import { requireActor } from "@/src/server/auth/session";
import { TopBar } from "./_components/top-bar";

/** Signed-in area. Each page and action checks the actor again (actions are reachable by POST). */
export default async function WorkspaceLayout({ children }: { children: React.ReactNode }) {
  const actor = await requireActor();
  return (
    <div className="flex min-h-screen flex-col">
      <TopBar actor={actor} />
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 sm:px-6 sm:py-8">
        {children}
      </main>
    </div>
  );
}
