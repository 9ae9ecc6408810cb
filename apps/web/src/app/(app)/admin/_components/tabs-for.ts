import type { AppAbility } from "@coldtrail/core";
import type { AdminTab } from "./admin-tabs";

/** The organisation's tabs this person may use; the same list decides where /admin lands. */
export function adminTabs(ability: AppAbility): AdminTab[] {
  const tabs: AdminTab[] = [];
  if (ability.can("read", "User")) tabs.push({ href: "/admin/people", label: "People" });
  if (ability.can("create", "Branch") || ability.can("update", "Branch")) tabs.push({ href: "/admin/branches", label: "Branches" });
  if (ability.can("read", "InspectorGrant")) tabs.push({ href: "/admin/inspectors", label: "Inspector access" });
  if (ability.can("read", "Settings")) tabs.push({ href: "/admin/settings", label: "Settings" });
  // The background runner's status is the owner's (updating settings is the owner's alone).
  if (ability.can("update", "Settings")) tabs.push({ href: "/admin/background", label: "Background work" });
  return tabs;
}
