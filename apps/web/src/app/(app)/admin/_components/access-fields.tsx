"use client";

import { useId } from "react";
import { ASSIGNABLE_ROLES, BRANCH_ROLES, ROLE_DESCRIPTIONS, ROLE_LABELS, type AssignableRole } from "@coldtrail/core";
import type { AdminBranchRow } from "@coldtrail/db";
import { FieldError } from "./form-bits";

export interface AccessValue {
  roles: AssignableRole[];
  branchIds: number[];
}

/**
 * Roles, then the branches the branch roles apply in. Checkbox groups in fieldsets with legends;
 * `lockedRoles` / `lockedBranches` are shown but cannot be ticked (e.g. adding to yourself).
 */
export function AccessFields({
  value,
  onChange,
  branches,
  errors,
  lockUnticked = false,
}: {
  value: AccessValue;
  onChange: (next: AccessValue) => void;
  branches: AdminBranchRow[];
  errors: { roles?: string; branchIds?: string };
  /** Only removing is possible (a person editing themselves). */
  lockUnticked?: boolean;
}) {
  const uid = useId();
  const needsBranches = value.roles.some((r) => BRANCH_ROLES.includes(r));
  const toggleRole = (role: AssignableRole, on: boolean) =>
    onChange({
      ...value,
      roles: on ? [...value.roles, role].filter((r, i, a) => a.indexOf(r) === i) : value.roles.filter((r) => r !== role),
    });
  const toggleBranch = (id: number, on: boolean) =>
    onChange({ ...value, branchIds: on ? [...new Set([...value.branchIds, id])] : value.branchIds.filter((b) => b !== id) });
  const shownBranches = branches.filter((b) => !b.archivedAt || value.branchIds.includes(b.id));

  return (
    <div className="space-y-5">
      <fieldset aria-describedby={errors.roles ? `${uid}-roles-error` : undefined}>
        <legend className="text-sm font-semibold text-ink-900">Roles</legend>
        <div className="mt-2 grid gap-2 sm:grid-cols-2">
          {ASSIGNABLE_ROLES.map((role) => {
            const checked = value.roles.includes(role);
            const locked = lockUnticked && !checked;
            return (
              <label
                key={role}
                className={`flex gap-3 rounded-md border p-3 ${checked ? "border-fjord-600 bg-fjord-50" : "border-ink-200 bg-white"} ${locked ? "opacity-60" : ""}`}
              >
                <input
                  type="checkbox"
                  name="roles"
                  value={role}
                  checked={checked}
                  disabled={locked}
                  onChange={(e) => toggleRole(role, e.target.checked)}
                  className="mt-1 h-4 w-4 accent-fjord-600"
                />
                <span>
                  <span className="block font-medium text-ink-950">{ROLE_LABELS[role]}</span>
                  <span className="block text-sm text-ink-600">{ROLE_DESCRIPTIONS[role]}</span>
                </span>
              </label>
            );
          })}
        </div>
        <FieldError id={`${uid}-roles-error`} message={errors.roles} />
      </fieldset>

      <fieldset aria-describedby={`${uid}-branches-hint${errors.branchIds ? ` ${uid}-branches-error` : ""}`}>
        <legend className="text-sm font-semibold text-ink-900">Branches</legend>
        <p id={`${uid}-branches-hint`} className="text-sm text-ink-600">
          {needsBranches
            ? "Where the branch manager and technician roles apply. Owners and compliance officers cover every branch."
            : "Owners and compliance officers cover every branch; branches apply to branch managers and technicians."}
        </p>
        <div className="mt-2 flex flex-wrap gap-2">
          {shownBranches.map((b) => {
            const checked = value.branchIds.includes(b.id);
            const locked = (lockUnticked && !checked) || !needsBranches;
            return (
              <label
                key={b.id}
                className={`flex items-center gap-2 rounded-md border px-3 py-2 ${checked && needsBranches ? "border-fjord-600 bg-fjord-50" : "border-ink-200 bg-white"} ${locked ? "opacity-60" : ""}`}
              >
                <input
                  type="checkbox"
                  name="branchIds"
                  value={b.id}
                  checked={checked && needsBranches}
                  disabled={locked}
                  onChange={(e) => toggleBranch(b.id, e.target.checked)}
                  className="h-4 w-4 accent-fjord-600"
                />
                <span>
                  {b.name} <span className="text-xs text-ink-500">{b.code}</span>
                  {b.archivedAt && <span className="text-xs text-ink-600"> · archived</span>}
                </span>
              </label>
            );
          })}
          {shownBranches.length === 0 && <p className="text-sm text-ink-600">No branches yet: open one under Branches first.</p>}
        </div>
        <FieldError id={`${uid}-branches-error`} message={errors.branchIds} />
      </fieldset>
    </div>
  );
}

/** What to send: branches only when a branch role is chosen. */
export function accessPayload(value: AccessValue): AccessValue {
  const needsBranches = value.roles.some((r) => BRANCH_ROLES.includes(r));
  return { roles: value.roles, branchIds: needsBranches ? value.branchIds : [] };
}
