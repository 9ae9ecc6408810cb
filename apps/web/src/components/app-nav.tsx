"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useState } from "react";

export const NAV_GROUPS = ["Work", "Compliance", "Registers", "Organisation"] as const;
export type NavGroup = (typeof NAV_GROUPS)[number];

export interface NavItem {
  href: string;
  label: string;
  group?: NavGroup;
}

function isActive(pathname: string, href: string, all: NavItem[]): boolean {
  if (href === "/") return pathname === "/";
  if (pathname === href) return true;
  // The most specific item wins (e.g. "Log a job" on /jobs/new, not "Jobs").
  const matches = all.filter((i) => i.href !== "/" && (pathname === i.href || pathname.startsWith(`${i.href}/`)));
  const best = matches.sort((a, b) => b.href.length - a.href.length)[0];
  return best?.href === href;
}

/**
 * The main navigation: a sidebar on wide screens, a menu that opens under the header on phones.
 * One <nav> element either way, so assistive technology finds one "Main" landmark.
 */
export function AppNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname();
  const [open, setOpen] = useState(false);
  useEffect(() => setOpen(false), [pathname]);

  const current = items.find((i) => isActive(pathname, i.href, items));
  const groups = NAV_GROUPS.map((g) => ({ group: g, items: items.filter((i) => (i.group ?? "Work") === g) })).filter(
    (g) => g.items.length > 0,
  );

  return (
    <div className="border-b border-ink-200 bg-white lg:sticky lg:top-14 lg:h-[calc(100dvh-3.5rem)] lg:w-56 lg:shrink-0 lg:overflow-y-auto lg:border-b-0 lg:border-r">
      <button
        type="button"
        aria-expanded={open}
        aria-controls="main-nav"
        onClick={() => setOpen((o) => !o)}
        className="flex w-full items-center justify-between px-4 py-3 text-left text-base font-medium text-ink-900 lg:hidden"
      >
        <span>
          <span aria-hidden="true" className="mr-2">
            ☰
          </span>
          Menu{current ? <span className="font-normal text-ink-600"> · {current.label}</span> : null}
        </span>
        <span aria-hidden="true">{open ? "▲" : "▼"}</span>
      </button>
      <nav id="main-nav" aria-label="Main" className={`${open ? "block" : "hidden"} px-3 pb-4 lg:block lg:pt-4`}>
        {groups.map(({ group, items: groupItems }) => (
          <div key={group} className="mb-4">
            <p className="px-2 pb-1 text-xs font-semibold uppercase tracking-wider text-ink-500">{group}</p>
            <ul className="space-y-0.5">
              {groupItems.map((item) => {
                const active = isActive(pathname, item.href, items);
                return (
                  <li key={item.href}>
                    <Link
                      href={item.href}
                      aria-current={active ? "page" : undefined}
                      className={`flex min-h-10 items-center rounded-md border-l-4 px-2 py-2 text-sm font-medium ${
                        active
                          ? "border-fjord-600 bg-fjord-50 text-fjord-800"
                          : "border-transparent text-ink-700 hover:bg-ink-100 hover:text-ink-950"
                      }`}
                    >
                      {item.label}
                    </Link>
                  </li>
                );
              })}
            </ul>
          </div>
        ))}
      </nav>
    </div>
  );
}
