"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/** Only pages that exist are linked here. */
const LINKS = [
  { href: "/", label: "Home" },
  { href: "/records", label: "Records" },
  { href: "/sources", label: "Sources" },
  { href: "/imports", label: "Import" },
  { href: "/review", label: "Review" },
  { href: "/rules", label: "Rules" },
  { href: "/coverage", label: "Coverage" },
  { href: "/export", label: "Export" },
] as const;

function isCurrent(pathname: string, href: string): boolean {
  return href === "/" ? pathname === "/" : pathname === href || pathname.startsWith(`${href}/`);
}

export function TopNav() {
  const pathname = usePathname() ?? "/";
  return (
    <nav className="top-nav" aria-label="Main">
      <ul>
        {LINKS.map((l) => (
          <li key={l.href}>
            <Link href={l.href} aria-current={isCurrent(pathname, l.href) ? "page" : undefined}>
              {l.label}
            </Link>
          </li>
        ))}
      </ul>
    </nav>
  );
}
