// Sign-ins and facts of the demo data (packages/db/README.md, "Demo data"), as the tests use them.
export const DEMO = {
  owner: "marguerite.halvorsen@kestrelmoor.example",
  officer: "teodora.vasquez-lind@kestrelmoor.example",
  managerColumbus: "grant.oyelaran@kestrelmoor.example",
  managerTucson: "lucia.baptiste-moreno@kestrelmoor.example",
  technicianColumbus: "marcus.delacroix-byrd@kestrelmoor.example",
  inspector: "harold.penwick@statewide-review.example",
  otherOrgManager: "wendell.ashgrove@quillfield-refrigeration.example",
  otherOrgTechnician: "paloma.quintero-dahl@quillfield-refrigeration.example",
  /** The inspector's active grant: Denver, records dated in 2025. */
  inspectorGrant: { branch: "Denver", from: "2025-01-01", to: "2025-12-31" },
} as const;
