import type { ReactNode } from "react";
import Link from "next/link";
import { requirePageUser } from "@/lib/auth/server";
import { can, ROLE_LABELS } from "@/lib/auth/roles";
import { NavLinks, type NavItem } from "@/components/shell/nav-links";
import { SignOutButton } from "@/components/shell/sign-out-button";

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const { user } = await requirePageUser();
  const items: NavItem[] = [
    { href: "/", label: "Dashboard" },
    { href: "/data", label: "Data" },
    { href: "/analyses", label: "Analyses" },
    { href: "/coverage", label: "Coverage" },
    { href: "/alerts", label: "Alerts" },
  ];
  if (can(user.role, "users:manage")) items.push({ href: "/admin", label: "Admin" });

  return (
    <div className="min-h-screen">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:bg-white focus:p-2">
        Skip to content
      </a>
      <header className="bg-night-950">
        <nav aria-label="Main" className="mx-auto flex max-w-6xl flex-wrap items-center gap-4 px-4 py-3">
          <Link href="/" className="mr-2 text-lg font-semibold text-white">
            Siderea<span className="text-dawn-500">.</span>
          </Link>
          <NavLinks items={items} />
          <div className="ml-auto flex items-center gap-3 text-sm text-mist-300">
            <span data-testid="signed-in-as">
              {user.name} · <span className="text-dawn-500">{ROLE_LABELS[user.role]}</span>
            </span>
            <SignOutButton />
          </div>
        </nav>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-8">
        {children}
      </main>
    </div>
  );
}
