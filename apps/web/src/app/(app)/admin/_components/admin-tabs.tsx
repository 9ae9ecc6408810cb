"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

export interface AdminTab {
  href: string;
  label: string;
}

export function AdminTabs({ tabs }: { tabs: AdminTab[] }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Organisation" className="flex gap-1 overflow-x-auto border-b border-ink-200">
      {tabs.map((tab) => {
        const active = pathname === tab.href || pathname.startsWith(`${tab.href}/`);
        return (
          <Link
            key={tab.href}
            href={tab.href}
            aria-current={active ? "page" : undefined}
            className={`-mb-px whitespace-nowrap border-b-2 px-3 py-2 text-sm font-medium ${
              active ? "border-fjord-600 text-ink-950" : "border-transparent text-ink-600 hover:border-ink-300 hover:text-ink-900"
            }`}
          >
            {tab.label}
          </Link>
        );
      })}
    </nav>
  );
}
