"use client";

import Link, { useLinkStatus } from "next/link";
import { usePathname } from "next/navigation";

export interface NavItem {
  href: string;
  label: string;
}

export function NavLinks({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  return (
    <ul className="flex flex-wrap gap-1">
      {items.map((item) => {
        const active = item.href === "/" ? pathname === "/" : pathname.startsWith(item.href);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={active ? "page" : undefined}
              className={`relative block rounded-md px-3 py-2 text-sm font-medium ${active ? "bg-night-700 text-white" : "text-mist-300 hover:bg-night-800 hover:text-white"}`}
            >
              {item.label}
              <PendingMark />
            </Link>
          </li>
        );
      })}
    </ul>
  );
}

/**
 * Feedback while the page a link leads to is on its way: a pulsing dot, and the word for screen
 * readers. (The signed-in area has no route-level loading fallback: a streamed fallback made the
 * first load of a page briefly carry a second, hidden copy of its content.)
 */
function PendingMark() {
  const { pending } = useLinkStatus();
  if (!pending) return null;
  return (
    <>
      <span aria-hidden data-testid="nav-pending" className="absolute right-1 top-1 h-1.5 w-1.5 animate-pulse rounded-full bg-dawn-500" />
      <span className="sr-only"> (loading)</span>
    </>
  );
}
