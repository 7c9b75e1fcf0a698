import { navItemsFor } from "@/app/_lib/capabilities";
import { verifySession } from "@/app/_lib/dal";
import { listWorkspacesForUser } from "@/db/queries/workspaces";
import { AppShell } from "@/components/shell/app-shell";
import { navItems } from "@/components/shell/nav-items";
import { AccountMenu } from "./_shell/account-menu";
import { QueryProvider } from "./_shell/query-provider";

/**
 * The signed-in shell. Verifies the session against the database (signed-out
 * visitors go to /sign-in), shows only the pages the member's role may open,
 * and offers a workspace switcher when the user belongs to several.
 */
export default async function StudioLayout({ children }: { children: React.ReactNode }) {
  const session = await verifySession();
  const workspaces = listWorkspacesForUser({ userId: session.userId }).map(
    ({ workspace, role }) => ({ id: workspace.id, name: workspace.name, role }),
  );
  return (
    <AppShell
      items={navItemsFor(session.role, navItems)}
      account={
        <AccountMenu
          name={session.name}
          role={session.role}
          activeWorkspaceId={session.workspaceId}
          workspaces={workspaces}
        />
      }
    >
      <QueryProvider>{children}</QueryProvider>
    </AppShell>
  );
}
